import { describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { createTestingPinia } from '@pinia/testing';
import { createMemoryHistory, createRouter } from 'vue-router';
import * as authApi from '@/api/auth';
import { ApiError } from '@/api/http';
import ResetView from '@/views/auth/ResetView.vue';

vi.mock('@/api/auth', () => ({ resetPassword: vi.fn() }));
const api = vi.mocked(authApi);

async function mountReset(query = '?token=abc&invite=1') {
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/reset', component: ResetView },
      { path: '/:rest(.*)*', component: { render: () => null } },
    ],
  });
  await router.push(`/reset${query}`);
  await router.isReady();
  const wrapper = mount(ResetView, { global: { plugins: [router, createTestingPinia({ createSpy: vi.fn })] }, attachTo: document.body });
  return wrapper;
}

function input(wrapper: Awaited<ReturnType<typeof mountReset>>, test: string) {
  const el = wrapper.get(`[data-test="${test}"]`);
  return el.element.tagName === 'INPUT' ? el : el.get('input');
}
const errorsShown = (wrapper: Awaited<ReturnType<typeof mountReset>>) => wrapper.findAll('.el-form-item__error').map((e) => e.text());

async function fillAndSubmit(wrapper: Awaited<ReturnType<typeof mountReset>>, password: string) {
  await input(wrapper, 'reset-password').setValue(password);
  await input(wrapper, 'reset-confirm').setValue(password);
  await wrapper.get('form').trigger('submit');
  await flushPromises();
}

describe('ResetView (password policy)', () => {
  it('when the page shows, then it states the policy: 12 characters, not common, not your name or e-mail', async () => {
    const wrapper = await mountReset();
    expect(wrapper.text()).toContain('at least 12 characters');
    expect(wrapper.get('[data-test="password-policy"]').text()).toContain('Not a common password, and not your name or e-mail address.');
    wrapper.unmount();
  });

  it('when the password has 11 characters, then the form says 12 and does not call the server', async () => {
    // Arrange
    const wrapper = await mountReset();
    // Act
    await fillAndSubmit(wrapper, 'larch-gantr');
    // Assert
    await vi.waitFor(() => expect(errorsShown(wrapper)).toEqual(['Use at least 12 characters.']));
    expect(api.resetPassword).not.toHaveBeenCalled();
    wrapper.unmount();
  });

  it('when the server refuses the password by its policy, then its reason shows beside the password field', async () => {
    // Arrange
    api.resetPassword.mockRejectedValue(
      new ApiError(400, 'validation_failed', 'Choose another password.', [{ path: 'password', message: 'must not contain your name' }]),
    );
    const wrapper = await mountReset();
    // Act
    await fillAndSubmit(wrapper, 'rita rivet builds gantries');
    // Assert
    expect(api.resetPassword).toHaveBeenCalledWith('abc', 'rita rivet builds gantries');
    await vi.waitFor(() => expect(errorsShown(wrapper)).toEqual(['Must not contain your name.']));
    expect(wrapper.find('[data-test="error-message"]').exists()).toBe(false);
    wrapper.unmount();
  });
});
