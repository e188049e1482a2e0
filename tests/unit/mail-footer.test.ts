import { describe, expect, it } from 'vitest';
import { departmentInWords, departmentLine, mailFooter } from '../../api/features/productions/department.ts';

// House wording for the closing line of Plinth's mails (common practice, no published source).
describe('the department named in every mail', () => {
  const lantern = { productionName: 'The Lantern Keeper', headNames: ['Marta Oyelaran'] };
  it('names the production and its head, or heads', () => {
    expect(departmentLine(lantern)).toBe('Production: The Lantern Keeper · Department head: Marta Oyelaran');
    expect(departmentLine({ productionName: 'Saltglass Mile', headNames: ['Anya Brook', 'Sol Varga'] })).toBe('Production: Saltglass Mile · Department heads: Anya Brook and Sol Varga');
    expect(departmentLine({ productionName: 'Saltglass Mile', headNames: [] })).toBe('Production: Saltglass Mile · Department head: not appointed yet');
    expect(departmentInWords(lantern)).toBe('the make-up department of The Lantern Keeper (department head: Marta Oyelaran)');
  });
  it('closes a mail with one line per production, and never with nothing', () => {
    expect(mailFooter(lantern)).toEqual(['', '—', 'Production: The Lantern Keeper · Department head: Marta Oyelaran']);
    expect(mailFooter([lantern, { productionName: 'Saltglass Mile', headNames: ['Sol Varga'] }]).slice(2)).toEqual([
      'Production: The Lantern Keeper · Department head: Marta Oyelaran',
      'Production: Saltglass Mile · Department head: Sol Varga',
    ]);
    expect(mailFooter([])).toEqual(['', '—', 'The make-up department, through Plinth']);
  });
});
