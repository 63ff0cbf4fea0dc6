import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import { ApiError } from '@/api/http';
import type { User } from '@/api/types';
import { useAuthStore } from '@/stores/auth';
import SignInView from '@/views/auth/SignInView.vue';

const MAKER: User = {
  id: 5,
  email: 'maker@example.test',
  name: 'Mo Maker',
  roles: ['maker'],
  disabled: false,
  isInvited: false,
  createdAt: '2025-01-01T00:00:00Z',
};

async function mountSignIn(path = '/sign-in') {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/sign-in', component: SignInView },
      { path: '/forgot', component: { render: () => null } },
      { path: '/:rest(.*)*', component: { render: () => null } },
    ],
  });
  await router.push(path);
  await router.isReady();
  const pinia = createTestingPinia({ createSpy: vi.fn });
  const wrapper = mount(SignInView, { global: { plugins: [router, pinia] }, attachTo: document.body });
  const auth = useAuthStore(pinia);
  return { wrapper, router, auth };
}

function field(wrapper: Awaited<ReturnType<typeof mountSignIn>>['wrapper'], test: string) {
  const el = wrapper.get(`[data-test="${test}"]`);
  return el.element.tagName === 'INPUT' ? el : el.get('input');
}

async function submit(wrapper: Awaited<ReturnType<typeof mountSignIn>>['wrapper']) {
  await wrapper.get('form').trigger('submit');
  await flushPromises();
}

const errorsShown = (wrapper: Awaited<ReturnType<typeof mountSignIn>>['wrapper']): string[] =>
  wrapper.findAll('.el-form-item__error').map((e) => e.text());

describe('SignInView', () => {
  it('when submitted empty, then names both missing fields and does not call the server', async () => {
    // Arrange
    const { wrapper, auth } = await mountSignIn();
    // Act
    await submit(wrapper);
    // Assert
    // Element Plus shows field messages after a short debounce of the validation state.
    await vi.waitFor(() => expect(errorsShown(wrapper)).toEqual(['Enter your e-mail address.', 'Enter your password.']));
    expect(auth.signIn).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('when the e-mail is malformed, then says so and does not call the server', async () => {
    const { wrapper, auth } = await mountSignIn();
    await field(wrapper, 'sign-in-email').setValue('not-an-address');
    await field(wrapper, 'sign-in-password').setValue('gantry-demo');
    await submit(wrapper);
    await vi.waitFor(() => expect(errorsShown(wrapper)).toEqual(['That does not look like an e-mail address.']));
    expect(auth.signIn).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('when the form is valid, then signs in and goes to the safe next path', async () => {
    // Arrange
    const { wrapper, auth, router } = await mountSignIn('/sign-in?next=/sheets/3');
    vi.mocked(auth.signIn).mockResolvedValue(MAKER);
    // Act
    await field(wrapper, 'sign-in-email').setValue('maker@example.test');
    await field(wrapper, 'sign-in-password').setValue('gantry-demo');
    await submit(wrapper);
    // Assert
    expect(auth.signIn).toHaveBeenCalledWith('maker@example.test', 'gantry-demo');
    expect(router.currentRoute.value.fullPath).toBe('/sheets/3');
    wrapper.unmount();
  });

  it('when next points to another site, then goes to the start page for the role instead', async () => {
    const { wrapper, auth, router } = await mountSignIn('/sign-in?next=//evil.example/');
    vi.mocked(auth.signIn).mockResolvedValue(MAKER);
    await field(wrapper, 'sign-in-email').setValue('maker@example.test');
    await field(wrapper, 'sign-in-password').setValue('gantry-demo');
    await submit(wrapper);
    expect(router.currentRoute.value.fullPath).toBe('/sheets');
    wrapper.unmount();
  });

  it('when the server refuses the credentials, then shows its message inline and clears the password', async () => {
    // Arrange
    const { wrapper, auth, router } = await mountSignIn();
    vi.mocked(auth.signIn).mockRejectedValue(new ApiError(401, 'invalid_credentials', 'Wrong e-mail or password.'));
    // Act
    await field(wrapper, 'sign-in-email').setValue('maker@example.test');
    await field(wrapper, 'sign-in-password').setValue('wrong-one');
    await submit(wrapper);
    // Assert
    expect(wrapper.get('[data-test="error-message"]').text()).toContain('Wrong e-mail or password.');
    expect((field(wrapper, 'sign-in-password').element as HTMLInputElement).value).toBe('');
    expect(router.currentRoute.value.path).toBe('/sign-in');
    wrapper.unmount();
  });

  it('when rendered, then links to the forgot-password page', async () => {
    const { wrapper } = await mountSignIn();
    expect(wrapper.get('[data-test="forgot-link"]').attributes('href')).toBe('/forgot');
    wrapper.unmount();
  });
});
