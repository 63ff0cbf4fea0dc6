import { afterEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils';
import { createMemoryHistory, createRouter } from 'vue-router';
import DesignsNewDialog from '@/views/designs/DesignsNewDialog.vue';
import DesignsRenameDialog from '@/views/designs/DesignsRenameDialog.vue';
import { designRow } from './designRow';

vi.setConfig({ testTimeout: 60_000 });

const BENCH = designRow({ id: 7, name: 'Bench dispensing stage', version: 3 });

/** The value of the text box with this data-test (the dialogs are teleported to the body). */
function boxValue(dataTest: string): string | undefined {
  return document.querySelector<HTMLInputElement>(`[data-test="${dataTest}"] input, input[data-test="${dataTest}"]`)?.value;
}

const mounted: VueWrapper[] = [];
afterEach(() => {
  mounted.splice(0).forEach((w) => w.unmount());
});

// The Designs list loads these dialogs on first use and mounts them already open (v-if + v-model both turn true).
describe('DesignsRenameDialog', () => {
  it('when it is mounted already open, then the name box holds the design’s name', async () => {
    // Arrange / Act
    mounted.push(mount(DesignsRenameDialog, { props: { modelValue: true, design: BENCH }, attachTo: document.body }));
    await flushPromises();
    // Assert
    expect(boxValue('rename-name')).toBe('Bench dispensing stage');
  });
});

describe('DesignsNewDialog', () => {
  const router = createRouter({ history: createMemoryHistory(), routes: [{ path: '/:p(.*)*', component: { render: () => null } }] });

  it('when it is mounted already open, then it starts from the crossed-belt template with its name', async () => {
    // Arrange / Act
    mounted.push(mount(DesignsNewDialog, { props: { modelValue: true }, global: { plugins: [router] }, attachTo: document.body }));
    await flushPromises();
    // Assert
    expect(boxValue('new-design-name')).toBe('New crossed-belt stage');
  });

  it('when it is mounted already open to copy a design, then it is in copy mode with “Copy of” and the name', async () => {
    // Arrange / Act
    mounted.push(
      mount(DesignsNewDialog, { props: { modelValue: true, copyFrom: BENCH }, global: { plugins: [router] }, attachTo: document.body }),
    );
    await flushPromises();
    // Assert
    expect(boxValue('new-design-name')).toBe('Copy of Bench dispensing stage');
    expect(document.querySelector('[data-test="new-mode-copy"]')?.className).toMatch(/is-active/);
  });
});
