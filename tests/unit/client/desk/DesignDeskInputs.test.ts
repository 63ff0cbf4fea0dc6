import { fieldMessage } from '@/format';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { computed, defineComponent, h, reactive } from 'vue';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { defaultDesign, designInputSchema, safeParseDesign, setAt } from '@/engine';
import { formIssues } from '@/composables/useEngine';
import DesignDeskInputs from '@/views/desk/DesignDeskInputs.vue';

/**
 * The form as the Design desk wires it: the design document in a reactive object, field messages from the shared
 * schema (safeParseDesign), and `set` events written back by path.
 */
function mountForm(isReadOnly = false) {
  const model = reactive(structuredClone(defaultDesign('corexy')) as unknown as Record<string, unknown>);
  const errors = computed(() => {
    const parsed = safeParseDesign(model);
    const out: Record<string, string> = {};
    if (!parsed.ok) for (const i of formIssues(model, parsed.issues)) out[i.path] ??= i.message;
    return out;
  });
  const Harness = defineComponent({
    setup() {
      return () =>
        h(DesignDeskInputs, {
          model,
          errors: errors.value,
          isReadOnly,
          shelf: { belts: [], pulleys: [], motors: [] },
          onSet: (path: string, value: unknown) => setAt(model, path, value),
        });
    },
  });
  const wrapper = mount(Harness, { attachTo: document.body });
  return { wrapper, model };
}

const fieldError = (wrapper: ReturnType<typeof mountForm>['wrapper'], path: string): string => {
  const item = wrapper.find(`[data-test="field-${path}"] .el-form-item__error`);
  return item.exists() ? item.text() : '';
};

// The whole form (about fifty Element Plus fields) renders slowly in jsdom; give each case room.
vi.setConfig({ testTimeout: 60_000 });

describe('DesignDeskInputs', () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  it('when a negative belt pitch is typed, then the schema message shows at that field, named by its label, as the API says it', async () => {
    // Arrange
    const { wrapper, model } = mountForm();
    // The API validates with the same zod schema: take its message for this value as the expectation.
    const apiMessage = designInputSchema
      .safeParse({ ...defaultDesign('corexy'), belt: { ...defaultDesign('corexy').belt, pitchMm: -2 } })
      .error?.issues.find((i) => i.path.join('.') === 'belt.pitchMm')?.message;
    // Act
    await wrapper.get('input[data-test="input-belt.pitchMm"]').setValue('-2');
    await flushPromises();
    // Assert
    expect((model.belt as { pitchMm: number }).pitchMm).toBe(-2);
    expect(apiMessage).toBe('belt pitch must be at least 0.5');
    // Element Plus shows a form item's message after a short debounce of its validation state.
    // fix: #13 validation messages name the field by its label
    await vi.waitFor(() => expect(fieldError(wrapper, 'belt.pitchMm')).toBe(fieldMessage('belt.pitchMm', apiMessage!)));
    expect(fieldError(wrapper, 'belt.pitchMm')).toBe('Belt pitch must be at least 0.5');
    expect(fieldError(wrapper, 'belt.widthMm')).toBe('');
    expect(wrapper.get('[data-test="group-problems-belts"]').text()).toContain('1');
    wrapper.unmount();
  });

  it('when letters are typed into the frame width, then the field says it must be a number', async () => {
    const { wrapper } = mountForm();
    await wrapper.get('input[data-test="input-frame.outerXMm"]').setValue('wide');
    await flushPromises();
    await vi.waitFor(() => expect(fieldError(wrapper, 'frame.outerXMm')).toBe('Frame width, outside (X) must be a number'));
    wrapper.unmount();
  });

  it('when the value is corrected, then the message goes away', async () => {
    const { wrapper } = mountForm();
    const input = wrapper.get('input[data-test="input-pulley.driveTeeth"]');
    await input.setValue('4');
    await flushPromises();
    await vi.waitFor(() => expect(fieldError(wrapper, 'pulley.driveTeeth')).toBe('Drive pulley must be at least 6'));
    await input.setValue('16');
    await flushPromises();
    await vi.waitFor(() => expect(fieldError(wrapper, 'pulley.driveTeeth')).toBe(''));
    wrapper.unmount();
  });

  it('when a wanted travel is switched on, then its two fields appear with the default values', async () => {
    const { wrapper, model } = mountForm();
    expect(wrapper.find('input[data-test="input-wantedTravel.xMm"]').exists()).toBe(false);
    await wrapper.get('[data-test="optional-wantedTravel"] .el-switch').trigger('click');
    await flushPromises();
    expect(model.wantedTravel).toEqual({ xMm: 300, yMm: 300 });
    expect((wrapper.get('input[data-test="input-wantedTravel.xMm"]').element as HTMLInputElement).value).toBe('300');
    wrapper.unmount();
  });

  it('when the form is read-only, then every input is disabled', () => {
    const { wrapper } = mountForm(true);
    const inputs = wrapper.findAll('input[data-test^="input-"]');
    expect(inputs.length).toBeGreaterThan(20);
    expect(inputs.every((i) => (i.element as HTMLInputElement).disabled)).toBe(true);
    wrapper.unmount();
  });
});
