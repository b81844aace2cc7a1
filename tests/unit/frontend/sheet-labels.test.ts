import { describe, expect, it } from 'vitest';
import { OPTIONS, valueLabel } from '@/components/sheet/sheetLabels';

describe('sheet labels', () => {
  it.each([
    ['chromoly_4130', '4130 chromoly'],
    ['mild_steel', 'Mild steel'],
    ['other', 'Other'], // a material or process, not a member
    ['main_hoop', 'Main hoop'],
    ['rear_brace', 'Rear brace (backstay)'],
    ['some_new_value', 'some new value'],
  ])('%s reads as %s', (value, label) => expect(valueLabel(value)).toBe(label));

  it('calls the member kind "other" an other member, and the material "other" just other', () => {
    expect(OPTIONS.kind.find((o) => o.value === 'other')?.label).toBe('Other member');
    expect(OPTIONS.material.find((o) => o.value === 'other')?.label).toBe('Other');
  });
});
