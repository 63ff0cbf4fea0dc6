import { beforeEach, describe, expect, it, vi } from 'vitest';
import { flushPromises, mount } from '@vue/test-utils';
import { ApiError } from '@/api/http';
import type { User } from '@/api/types';
import * as usersApi from '@/api/users';
import TeamInviteDialog from '@/views/team/TeamInviteDialog.vue';

vi.mock('@/api/users', () => ({ listUsers: vi.fn(), inviteUser: vi.fn(), updateUser: vi.fn() }));
const api = vi.mocked(usersApi);

const NEW_USER: User = {
  id: 9,
  email: 'rita@example.test',
  name: 'Rita Rivet',
  roles: ['maker'],
  disabled: false,
  isInvited: false,
  createdAt: '2025-01-01T00:00:00Z',
};

async function mountDialog() {
  const wrapper = mount(TeamInviteDialog, { props: { modelValue: true }, attachTo: document.body });
  await flushPromises();
  return wrapper;
}

function input(wrapper: Awaited<ReturnType<typeof mountDialog>>, test: string) {
  const el = wrapper.get(`[data-test="${test}"]`);
  return el.element.tagName === 'INPUT' ? el : el.get('input');
}

/** The message shown beside the form item whose label is `label`. */
function messageBeside(wrapper: Awaited<ReturnType<typeof mountDialog>>, label: string): string | undefined {
  const item = wrapper.findAll('.el-form-item').find((i) => i.find('.el-form-item__label').text() === label);
  return item?.find('.el-form-item__error').exists() ? item.find('.el-form-item__error').text() : undefined;
}

async function fillAndSend(wrapper: Awaited<ReturnType<typeof mountDialog>>) {
  await input(wrapper, 'invite-name').setValue('Rita Rivet');
  await input(wrapper, 'invite-email').setValue('rita@example.test');
  await wrapper.get('[data-test="invite-submit"]').trigger('click');
  await flushPromises();
}

describe('TeamInviteDialog', () => {
  beforeEach(() => {
    vi.resetAllMocks();
  });

  it('when the server accepts the invitation, then sends name, e-mail and roles, emits invited and closes', async () => {
    // Arrange
    api.inviteUser.mockResolvedValue({ user: NEW_USER });
    const wrapper = await mountDialog();
    // Act
    await fillAndSend(wrapper);
    // Assert
    expect(api.inviteUser).toHaveBeenCalledWith({ name: 'Rita Rivet', email: 'rita@example.test', roles: ['designer'] });
    expect(wrapper.emitted('invited')).toEqual([[NEW_USER]]);
    expect(wrapper.emitted('update:modelValue')).toEqual([[false]]);
    wrapper.unmount();
  });

  it('when the server reports a field error, then shows it beside that field and keeps the dialog open', async () => {
    // Arrange
    api.inviteUser.mockRejectedValue(
      new ApiError(400, 'validation_failed', 'The request is not valid.', [{ path: 'name', message: 'must be at most 120 characters' }]),
    );
    const wrapper = await mountDialog();
    // Act
    await fillAndSend(wrapper);
    // Assert
    await vi.waitFor(() => expect(messageBeside(wrapper, 'Name')).toBe('Must be at most 120 characters.'));
    expect(wrapper.find('[data-test="form-error"]').exists()).toBe(false);
    expect(wrapper.emitted('update:modelValue')).toBeUndefined();
    wrapper.unmount();
  });

  it('when the e-mail is already taken, then says so beside the e-mail field', async () => {
    api.inviteUser.mockRejectedValue(new ApiError(409, 'email_taken', 'A user with the e-mail rita@example.test already exists.'));
    const wrapper = await mountDialog();
    await fillAndSend(wrapper);
    await vi.waitFor(() => expect(messageBeside(wrapper, 'E-mail')).toBe('A user with the e-mail rita@example.test already exists.'));
    wrapper.unmount();
  });

  it('when the server fails without field details, then shows its message above the form', async () => {
    api.inviteUser.mockRejectedValue(new ApiError(503, 'db_unavailable', 'The database is not answering.'));
    const wrapper = await mountDialog();
    await fillAndSend(wrapper);
    expect(wrapper.get('[data-test="form-error"]').text()).toContain('The database is not answering.');
    wrapper.unmount();
  });

  it('when no role is picked, then asks for one and does not call the server', async () => {
    const wrapper = await mountDialog();
    await wrapper.get('[data-test="role-designer"] input').setValue(false);
    await fillAndSend(wrapper);
    await vi.waitFor(() => expect(messageBeside(wrapper, 'Roles')).toBe('Pick at least one role.'));
    expect(api.inviteUser).not.toHaveBeenCalled();
    wrapper.unmount();
  });
});
