import { beforeEach, describe, expect, it } from 'vitest';
import { defineComponent, h, ref } from 'vue';
import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import QuantityInput from '@/components/units/QuantityInput.vue';
import UnitToggle from '@/components/units/UnitToggle.vue';
import { UNITS_STORAGE_KEY, useUnitsStore } from '@/stores/units';

/** A length input and a torque input next to the unit toggle, as on the Design desk. */
function mountHarness(initialMm: number, initialNm: number) {
  const lengthMm = ref<number | null>(initialMm);
  const torqueNm = ref<number | null>(initialNm);
  const Harness = defineComponent({
    setup() {
      return () =>
        h('div', [
          h(UnitToggle),
          h(QuantityInput, {
            modelValue: lengthMm.value,
            quantity: 'length',
            stored: 'mm',
            'data-test': 'length',
            'onUpdate:modelValue': (v: number | null) => (lengthMm.value = v),
          }),
          h(QuantityInput, {
            modelValue: torqueNm.value,
            quantity: 'torque',
            stored: 'N m',
            'data-test': 'torque',
            'onUpdate:modelValue': (v: number | null) => (torqueNm.value = v),
          }),
        ]);
    },
  });
  const wrapper = mount(Harness, { attachTo: document.body });
  // Element Plus puts extra attributes on the <input> itself; the unit label sits in the same .el-input.
  const input = (name: string) => wrapper.get(`input[data-test="${name}"]`);
  const unit = (name: string) => wrapper.findAll('[data-test="quantity-unit"]')[name === 'length' ? 0 : 1].text();
  return { wrapper, lengthMm, torqueNm, input, unit };
}

async function choose(wrapper: ReturnType<typeof mountHarness>['wrapper'], system: 'metric' | 'imperial') {
  await wrapper.get(`[data-test="units-${system}"] input`).setValue(true);
  await flushPromises();
}

describe('UnitToggle with QuantityInput', () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  // fix: #13 imperial inputs showed conversion noise ("0.787402 in"); the box now shows the fewest digits within 0.01 %
  it('when switched to imperial, then 460 mm reads 18.11 in and the stored value stays 460 mm', async () => {
    // Arrange
    const { wrapper, lengthMm, input, unit } = mountHarness(460, 0.45);
    expect((input('length').element as HTMLInputElement).value).toBe('460');
    expect(unit('length')).toBe('mm');
    // Act
    await choose(wrapper, 'imperial');
    // Assert
    expect((input('length').element as HTMLInputElement).value).toBe('18.11');
    expect(unit('length')).toBe('in');
    expect(lengthMm.value).toBe(460);
    wrapper.unmount();
  });

  it('when 10 in is typed in imperial and metric is chosen again, then it round-trips to 254 mm', async () => {
    const { wrapper, lengthMm, input } = mountHarness(460, 0.45);
    await choose(wrapper, 'imperial');
    // Act
    await input('length').setValue('10');
    await choose(wrapper, 'metric');
    // Assert
    expect(lengthMm.value).toBeCloseTo(254, 10);
    expect((input('length').element as HTMLInputElement).value).toBe('254');
    wrapper.unmount();
  });

  it('when torque is shown in imperial, then N·m converts to oz·in with the NIST SP 811 factor 7.061552e-3', async () => {
    const { wrapper, torqueNm, input, unit } = mountHarness(460, 0.45);
    await choose(wrapper, 'imperial');
    // Assert: 0.45 N·m / 7.061552e-3 N·m per oz·in = 63.725 oz·in, shown to within 0.01 %
    expect(unit('torque')).toBe('oz·in');
    const shown = Number((input('torque').element as HTMLInputElement).value);
    expect(Math.abs(shown - 0.45 / 7.061552e-3) / (0.45 / 7.061552e-3)).toBeLessThan(1e-4);
    // Act: typing 100 oz·in stores 0.7061552 N·m
    await input('torque').setValue('100');
    expect(torqueNm.value).toBeCloseTo(100 * 7.061552e-3, 6);
    wrapper.unmount();
  });

  it('when a system is chosen, then it is kept in localStorage for the next visit', async () => {
    const { wrapper } = mountHarness(460, 0.45);
    await choose(wrapper, 'imperial');
    expect(localStorage.getItem(UNITS_STORAGE_KEY)).toBe('imperial');
    // A new page load (fresh pinia) reads it back.
    setActivePinia(createPinia());
    expect(useUnitsStore().system).toBe('imperial');
    wrapper.unmount();
  });

  it('when letters are typed, then NaN is emitted so the schema reports the field', async () => {
    const { wrapper, lengthMm, input } = mountHarness(460, 0.45);
    await input('length').setValue('abc');
    expect(lengthMm.value).toBeNaN();
    expect((input('length').element as HTMLInputElement).value).toBe('abc');
    wrapper.unmount();
  });
});
