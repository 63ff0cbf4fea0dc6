// House rules as lint (DEVELOPERS.md "House rules"). Syntax-level rules only, so `npm run lint` stays fast;
// the type-level checks are `npm run typecheck`. Formatting belongs to Prettier (eslint-config-prettier turns
// off every rule that would fight it).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import pluginVue from 'eslint-plugin-vue';
import { importX, createNodeResolver } from 'eslint-plugin-import-x';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import prettier from 'eslint-config-prettier';

// The layering, as "a file in `target` never imports from `from`". Each zone names why.
const layers = [
  // The engine is pure: it runs in the browser, the server, the worker pools and the CLI alike.
  {
    target: './src/engine',
    from: ['./src', './server', './scripts', './tests'],
    except: ['./engine'],
    message: 'the engine imports only itself (and zod)',
  },
  // The formatting layer is shared by the screen, the sheet and the e-mails: pure as well.
  {
    target: './src/format',
    from: ['./src/api', './src/stores', './src/views', './src/components', './src/composables', './server', './scripts'],
    message: 'the formatting layer is pure',
  },
  // The contract between client and server is pure too: both sides and the workers import it. It may name the
  // engine's and the formatting layer's types (both pure), nothing else.
  {
    target: './src/contracts',
    from: ['./src', './server', './scripts', './tests'],
    except: ['./contracts', './engine', './format'],
    message: 'the contracts import only themselves, the engine and the formatting layer',
  },
  // The browser bundle never reaches into the server.
  { target: './src', from: ['./server', './scripts'], message: 'client code never imports server code' },
  // Routes → services → models: a route never touches a model, a service never touches the HTTP layer.
  { target: './server/routes', from: ['./server/models'], message: 'routes call services, not models' },
  { target: './server/services', from: ['./server/routes', './server/middleware'], message: 'services do not know about HTTP' },
  {
    target: './server/models',
    from: ['./server/routes', './server/services', './server/middleware'],
    message: 'models are the bottom layer',
  },
];

export default tseslint.config(
  {
    ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**', 'reference/**', 'public/**', '**/*.d.ts', 'src/workers/plotly-*.js'],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...pluginVue.configs['flat/recommended'],
  {
    files: ['**/*.vue'],
    languageOptions: { parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.vue'] } },
  },
  {
    plugins: { 'import-x': importX },
    settings: {
      // `@/…` resolves through the tsconfig paths (client and server configs both map it to src/).
      'import-x/resolver-next': [
        createTypeScriptImportResolver({ project: ['tsconfig.json', 'server/tsconfig.json'] }),
        createNodeResolver(),
      ],
    },
    languageOptions: {
      globals: {
        // Node and browser globals both appear (server, scripts, client); TypeScript already rejects a wrong one.
        window: 'readonly',
        document: 'readonly',
        navigator: 'readonly',
        console: 'readonly',
        process: 'readonly',
        Buffer: 'readonly',
        setTimeout: 'readonly',
        clearTimeout: 'readonly',
        setInterval: 'readonly',
        clearInterval: 'readonly',
        URL: 'readonly',
        URLSearchParams: 'readonly',
        fetch: 'readonly',
      },
    },
    rules: {
      // TypeScript checks undefined names better than this rule (it knows DOM and Node types).
      'no-undef': 'off',
      // `typeof import('…')` stays allowed: lazily loaded modules (plotly, worker tasks, vi.mock) are typed that way.
      '@typescript-eslint/consistent-type-imports': [
        'error',
        { prefer: 'type-imports', fixStyle: 'inline-type-imports', disallowTypeAnnotations: false },
      ],
      // The uploads and the sheet text strip or refuse control characters on purpose.
      'no-control-regex': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      'import-x/no-extraneous-dependencies': [
        'error',
        {
          devDependencies: ['tests/**', 'scripts/**', '*.config.{js,ts}', 'vite.config.ts', 'vitest.config.ts'],
          includeTypes: false,
        },
      ],
      'import-x/no-restricted-paths': ['error', { zones: layers }],
      'import-x/no-self-import': 'error',
      'import-x/no-duplicates': 'error',
      // Single-word component names are the house's (App.vue, views named by route); Prettier owns layout.
      'vue/multi-word-component-names': 'off',
      // Vue 3 has no filters; this rule reads a TypeScript union in a template (`value as string | number`) as one.
      'vue/no-deprecated-filter': 'off',
    },
  },
  {
    // Test files may use non-null assertions and empty stubs freely; the assertions are what matter there.
    files: ['tests/**'],
    rules: { '@typescript-eslint/no-non-null-assertion': 'off', '@typescript-eslint/no-empty-function': 'off' },
  },
  prettier,
);
