// Numbers at the inputs: canonical millimetres and kilograms shown in the builder's units with the
// trade's decimals, typed text turned back into canonical values, and mistakes said at the input.
import { describe, expect, test } from 'vitest';
import { defineComponent, h, ref, computed } from 'vue';
import { mount } from '@vue/test-utils';
import { formatForInput, inputUnitLabel, parseInput, type InputRules } from '@/composables/useUnitInput';
import { provideSheetInputs } from '@/composables/useBuildSheetInputs';
import { emptyDraft } from '@/composables/useBuildSheetDraft';
import SheetQuantityInput from '@/components/sheet/SheetQuantityInput.vue';
import type { UnitSystem } from '@domain/index';

describe('shown at the input', () => {
  test.each<[number, UnitSystem, string]>([
    [38.1, 'imperial', '1.500'], // F-UNIT-1: 1.5 in = 38.1 mm exactly
    [2.413, 'imperial', '0.095'], // F-UNIT-2: 0.095 in = 2.413 mm
    [44.45, 'imperial', '1.750'], // F-UNIT-2: 1.75 in = 44.45 mm
    [45, 'imperial', '1.7717'], // F-UNIT-2: 45 mm = 1.772 in; a fourth decimal keeps the stored 45 mm visible
    [45, 'metric', '45.0'],
    [2.5, 'metric', '2.50'],
    [2.413, 'metric', '2.413'], // a size typed in inches keeps its exact millimetres
    [1088.621688, 'imperial', '2400'], // 2,400 lb × 0.45359237 kg/lb (F-UNIT-1, exact pound)
  ])('%d canonical in %s → "%s"', (canonical, units, text) => {
    const dimension = canonical > 500 ? 'mass' : 'length';
    expect(formatForInput(canonical, dimension, units)).toBe(text);
  });

  test('an empty value shows as an empty input', () => {
    expect(formatForInput(undefined, 'length', 'imperial')).toBe('');
  });

  test.each<[UnitSystem, string, string]>([
    ['imperial', 'length', 'in'],
    ['metric', 'length', 'mm'],
    ['imperial', 'mass', 'lb'],
    ['metric', 'mass', 'kg'],
  ])('%s %s inputs are labelled %s', (units, dimension, label) => {
    expect(inputUnitLabel(dimension as 'length' | 'mass', units)).toBe(label);
  });
});

describe('typed at the input', () => {
  test.each<[string, UnitSystem, number]>([
    ['1.5', 'imperial', 38.1], // F-UNIT-1
    ['1 1/2', 'imperial', 38.1],
    ['0.095', 'imperial', 2.413], // F-UNIT-2
    ['45', 'metric', 45],
    ['45 mm', 'imperial', 45], // a unit typed with the number wins over the display unit
    ['1,75in', 'metric', 44.45],
  ])('"%s" in %s → %d mm', (text, units, mm) => {
    const parsed = parseInput(text, 'length', units);
    expect(parsed.ok).toBe(true);
    if (parsed.ok) expect(parsed.value).toBeCloseTo(mm, 9);
  });

  test('round trip: what is shown parses back to the same canonical value within the shown precision', () => {
    for (const mm of [38.1, 41.275, 44.45, 2.413, 3.048, 50.8]) {
      const shown = formatForInput(mm, 'length', 'imperial');
      const back = parseInput(shown, 'length', 'imperial');
      expect(back.ok && Math.abs(back.value! - mm)).toBeLessThan(0.0001 * 25.4);
    }
  });

  test.each<[string, string]>([
    ['abc', '"abc" is not a number.'],
    ['-1', 'Must be more than zero.'],
    ['0', 'Must be more than zero.'],
    ['1.5 kg', '"kg" is not a unit of length.'],
  ])('"%s" is refused with "%s"', (text, message) => {
    expect(parseInput(text, 'length', 'imperial')).toEqual({ ok: false, message });
  });

  test('a limit is said in the builder units, with the hint for an implausible size', () => {
    expect(parseInput('40', 'length', 'imperial', { max: 150, maxHint: 'that is not a cage tube; check the units' })).toEqual({
      ok: false,
      message: 'Over 5.906 in: that is not a cage tube; check the units.',
    });
    expect(parseInput('-5', 'length', 'metric', { min: -1000, max: 1000 })).toEqual({ ok: true, value: -5 });
    expect(parseInput('3.5', 'count', 'metric', { min: 0, integer: true })).toEqual({ ok: false, message: 'Must be a whole number.' });
  });

  test('empty text means "not measured", not zero', () => {
    expect(parseInput('  ', 'length', 'metric')).toEqual({ ok: true, value: undefined });
  });

  test('a field that cannot be empty (a node coordinate) refuses empty text with its own message', () => {
    const rules = { min: -5000, max: 5000, required: 'A node needs all three coordinates: type 0 for one on the origin.' };
    expect(parseInput('', 'length', 'metric', rules)).toEqual({ ok: false, message: rules.required });
    expect(parseInput('0', 'length', 'metric', rules)).toEqual({ ok: true, value: 0 });
  });
});

describe('the input component', () => {
  function host(units: UnitSystem, initial?: number, field: { path: string; dimension: 'length' | 'mass' } = { path: 'members.0.wallMm', dimension: 'length' }, rules?: InputRules) {
    const value = ref<number | undefined>(initial);
    const Host = defineComponent({
      setup() {
        const inputs = provideSheetInputs(ref(emptyDraft('c')), computed(() => units), computed(() => ({})), computed(() => ({})));
        return () =>
          h('div', [
            h(SheetQuantityInput, {
              path: field.path,
              label: 'Wall',
              dimension: field.dimension,
              modelValue: value.value,
              ...(rules ? { rules } : {}),
              'onUpdate:modelValue': (v: number | undefined) => (value.value = v),
            }),
            h('output', Object.keys(inputs.parseErrors).join(',')),
          ]);
      },
    });
    return { wrapper: mount(Host), value };
  }

  test('shows the unit, and typing in inches stores millimetres without re-formatting the typing', async () => {
    const { wrapper, value } = host('imperial');
    expect(wrapper.find('.qty__unit').text()).toBe('in');
    const input = wrapper.find('input');
    await input.setValue('0.09');
    expect(value.value).toBeCloseTo(2.286, 9);
    expect((input.element as HTMLInputElement).value).toBe('0.09');
    await input.trigger('blur');
    expect((input.element as HTMLInputElement).value).toBe('0.090');
  });

  test('a value from outside (load, copy) shows in the builder units', async () => {
    const { wrapper, value } = host('imperial', 38.1);
    expect((wrapper.find('input').element as HTMLInputElement).value).toBe('1.500');
    value.value = 2.413;
    await wrapper.vm.$nextTick();
    expect((wrapper.find('input').element as HTMLInputElement).value).toBe('0.095');
  });

  test('an invalid entry is said at the input, keeps the text and is reported to the editor', async () => {
    const { wrapper, value } = host('metric', 2.5);
    await wrapper.find('input').setValue('2..5');
    expect(wrapper.find('.qty__msg--bad').text()).toBe('"2..5" is not a number.');
    expect((wrapper.find('input').element as HTMLInputElement).value).toBe('2..5');
    expect(value.value).toBe(2.5);
    expect(wrapper.find('input').attributes('aria-invalid')).toBe('true');
    expect(wrapper.find('output').text()).toBe('members.0.wallMm');
  });

  test('emptying a node coordinate is refused at the input and the node keeps its place', async () => {
    const rules = { min: -5000, max: 5000, required: 'A node needs all three coordinates: type 0 for one on the origin.' };
    const { wrapper, value } = host('metric', 812, { path: 'model.nodes.0.zMm', dimension: 'length' }, rules);
    await wrapper.find('input').setValue('');
    expect(wrapper.find('.qty__msg--bad').text()).toBe('A node needs all three coordinates: type 0 for one on the origin.');
    expect(value.value).toBe(812);
    await wrapper.find('input').setValue('0');
    expect(value.value).toBe(0);
  });

  // Issue 9 §1: weights as rulebooks print them, and the slips a range catches.
  const weight = { path: 'vehicle.weightWithoutDriverKg', dimension: 'mass' } as const;
  test('"2,800" in inch-pound mode is 2,800 lb, not 2.8 lb', async () => {
    const { wrapper, value } = host('imperial', undefined, weight);
    await wrapper.find('input').setValue('2,800');
    expect(value.value).toBeCloseTo(2800 * 0.45359237, 9); // F-UNIT-1: 1 lb = 0.45359237 kg exactly
    expect(wrapper.find('.qty__msg--bad').exists()).toBe(false);
  });

  test.each<[UnitSystem, string, string]>([
    ['imperial', '2,8', '"2,8": in inch-pound units a comma groups thousands (2,800), so this is not clear. Type a decimal with a point (2.8).'],
    ['metric', '2,800', '"2,800" could mean 2800 or 2.8. Type 2800 or 2.8 to say which.'],
    ['imperial', '28', "A race car's weight is 441 to 11,023 lb: check the units."],
    ['metric', '2.8', "A race car's weight is 200 to 5,000 kg: check the units."],
    ['metric', '12 500', "A race car's weight is 200 to 5,000 kg: check the units."],
  ])('in %s mode "%s" is refused at the weight input: %s', async (units, text, message) => {
    const { wrapper, value } = host(units, 1000, weight);
    await wrapper.find('input').setValue(text);
    expect(wrapper.find('.qty__msg--bad').text()).toBe(message);
    expect(value.value).toBe(1000);
    expect(wrapper.find('output').text()).toBe('vehicle.weightWithoutDriverKg');
  });

  test('a wall has its own range, not the weight\'s nor the brace length\'s', async () => {
    const { wrapper, value } = host('metric', 2.5);
    await wrapper.find('input').setValue('25');
    expect(wrapper.find('.qty__msg--bad').text()).toBe("A cage tube's wall is 0.5 to 10 mm: check the units.");
    expect(value.value).toBe(2.5);
  });
});
