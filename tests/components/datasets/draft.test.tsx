import { descriptionOf, emptyDraft, guessAxis, guessMapping, labelFromFileName } from '../../../components/datasets/draft';
import { datasetDescription, datasetLabel } from '../../../shared/notebook/datasets';

describe('what the form fills in by itself', () => {
  it('makes a dataset label from a file name that the label rule accepts, numbered when taken', () => {
    // The rule is datasetLabel in shared/notebook/datasets.ts: a lower-case word of letters, digits and _.
    const cases: [string, string[], string][] = [
      ['Lattice-nu.csv', [], 'lattice_nu'],
      ['2024 bound (Λ=27).tsv', [], 'bound_27'],
      ['bound.csv', ['bound'], 'bound2'],
      ['bound.csv', ['bound', 'bound2'], 'bound3'],
      ['123.csv', [], 'data'],
    ];
    for (const [fileName, taken, expected] of cases) {
      const label = labelFromFileName(fileName, taken);
      expect(label).toBe(expected);
      expect(datasetLabel.safeParse(label).success).toBe(true);
    }
  });

  it('reads the trade\'s usual column names as axes and anything else as a named axis', () => {
    // Column spellings as people write them (common practice); `other` keeps the column's own name.
    expect(guessAxis('Δφ', 's')).toEqual({ kind: 'Delta_phi', label: '' });
    expect(guessAxis('Delta_phi^2', 'nuInv')).toEqual({ kind: 'Delta_phi2', label: '' });
    expect(guessAxis('1/nu', 's')).toEqual({ kind: 'nuInv', label: '' });
    expect(guessAxis('η', 's')).toEqual({ kind: 'eta', label: '' });
    expect(guessAxis('beta/nu', 's')).toEqual({ kind: 'other', label: 'beta/nu' });
    expect(guessAxis('column 2', 'nuInv')).toEqual({ kind: 'nuInv', label: '' });
  });

  it('takes error columns after x and y as symmetric, or as lower and upper when named so', () => {
    expect(guessMapping(['s', 'eta', 'err'])).toMatchObject({ x: 0, y: 1, yErrorKind: 'symmetric', yError: 2 });
    expect(guessMapping(['s', 'eta', 'err_lo', 'err_hi'])).toMatchObject({ yErrorKind: 'asymmetric', yErrorLower: 2, yErrorUpper: 3 });
    expect(guessMapping(['s', 'eta', 'nu'])).toMatchObject({ yErrorKind: 'none' });
  });

  it('describes a draft in the shape the API validates', () => {
    const draft = { ...emptyDraft(), label: 'eta', name: 'Invented η', mapping: { ...emptyDraft().mapping, xError: 2 }, yAxis: { kind: 'other' as const, label: 'β/ν' } };
    const description = descriptionOf(draft, { delimiter: ',', header: false, columns: ['column 1', 'column 2', 'column 3'], rows: [], rowCount: 0 });
    expect(datasetDescription.parse(description)).toEqual(description);
    expect(description).toMatchObject({ header: false, yAxis: { kind: 'other', label: 'β/ν' }, mapping: { x: 0, y: 1, yError: { kind: 'none' }, xError: 2 } });
  });
});
