// The steward sees a maker's certificate where the rulebook accepts one in place of its build rules
// (issue 9 §3): the card names the certificate, the dates, and how many rules it stood in for.
import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import ReviewCageCard from '@/components/review/ReviewCageCard.vue';

describe('ReviewCageCard', () => {
  it('names the certificate and its issuer, the approval and build dates, and the rules the certificate stood in for', () => {
    const w = mount(ReviewCageCard, {
      props: { cage: { approvedOn: '1998-05-14', builtOn: '1998-03-01', certificate: { issuer: 'Example Cage Works', number: 'ECW-0457' } }, certifiedFindings: 2 },
    });
    const text = w.text();
    expect(text).toContain("Maker's certificate");
    expect(text).toContain('ECW-0457 (Example Cage Works)');
    expect(text).toContain('14 May 1998');
    expect(text).toContain('1 Mar 1998');
    expect(text).toContain('in place of 2 rules, which the check did not apply');
  });

  it('says "one rule" for one, and nothing about rules without a certificate', () => {
    expect(mount(ReviewCageCard, { props: { cage: { certificate: { number: 'H-12' } }, certifiedFindings: 1 } }).text()).toContain('in place of one rule,');
    const dated = mount(ReviewCageCard, { props: { cage: { approvedOn: '1994-06-01' }, certifiedFindings: 0 } }).text();
    expect(dated).toContain('1 Jun 1994');
    expect(dated).not.toContain('in place of');
  });

  it('says so when the sheet gives neither dates nor a certificate', () => {
    expect(mount(ReviewCageCard, { props: { cage: undefined, certifiedFindings: 0 } }).text()).toContain("The sheet gives no approval date and no maker's certificate.");
  });
});
