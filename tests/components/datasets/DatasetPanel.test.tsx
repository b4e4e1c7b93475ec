import { fireEvent, screen, waitFor, within } from '@testing-library/react-native';
import { DatasetPanel } from '../../../components/datasets/DatasetPanel';
import type { CellView, NotebookDetail } from '../../../shared/notebook';
import type { DatasetView } from '../../../shared/notebook/datasets';
import type { NotebookRole } from '../../../shared/notebook/sharing';
import { renderWithQueryClient } from '../testUtils';

jest.mock('../../../components/formula', () => {
  const { Text: MockText } = jest.requireActual<typeof import('react-native')>('react-native');
  return { Formula: ({ tex }: { tex: string }) => <MockText testID="tex">{tex}</MockText> };
});
jest.mock('expo-document-picker', () => ({ getDocumentAsync: jest.fn() }));
jest.mock('../../../components/notebook/saveFile', () => ({ saveTextFile: jest.fn(async () => undefined) }));
const { getDocumentAsync } = jest.requireMock<{ getDocumentAsync: jest.Mock }>('expo-document-picker');
const { saveTextFile } = jest.requireMock<{ saveTextFile: jest.Mock }>('../../../components/notebook/saveFile');

// The first render loads the parser and every form module, which can take long on a busy machine.
jest.setTimeout(30_000);

// Demo data below is invented for these tests: names, numbers and people.
const NB = 'nbinvented01';

const scanCell: CellView = {
  id: 'cellscan00001', position: 1, label: 'scan', kind: 'scan', revision: 1, state: 'up-to-date', dependents: [], lastRun: null, updatedAt: '2026-01-01T00:00:00Z',
  input: { kind: 'scan', uses: 'setup', from: '1.55', to: '1.95', points: 41, quantities: ['nuInv'] },
};

const boundary: DatasetView = {
  id: 'dsinvented01', label: 'bound', name: 'Invented bound on Δφ²', source: 'Invented bootstrap run', note: '', shape: 'boundary',
  xAxis: { kind: 'Delta_phi' }, yAxis: { kind: 'Delta_phi2' }, hasYErrors: 'none', hasXErrors: false, rowCount: 40,
  xRange: ['0.51', '0.58'], yRange: ['1.2', '1.6'], fileName: 'bound.csv', contentHash: 'h1', createdAt: '2026-01-02T09:00:00Z', createdByName: 'Invented Lead',
};

function notebookAs(role: NotebookRole, datasets: DatasetView[] = [], cells: CellView[] = [scanCell]): NotebookDetail {
  const canEdit = role === 'owner' || role === 'editor';
  return { id: NB, title: 'Invented check', summary: '', ownerId: 'uinvented01', ownerName: 'Invented Lead', groupId: null, groupName: null, cellCount: cells.length, updatedAt: '2026-01-01T00:00:00Z', role, sharedBy: null, canEdit, cells, datasets };
}

type Answer = { status: number; body: unknown; text?: string };
let answers: Record<string, Answer>;
let requests: { method: string; path: string; body: unknown }[];

/** The parts of a multipart body, whichever FormData the test environment provides. */
function formParts(body: unknown): Record<string, unknown> {
  const form = body as { getParts?: () => { fieldName: string; string?: string }[]; get?: (name: string) => unknown };
  if (form.getParts) return Object.fromEntries(form.getParts().map((part) => [part.fieldName, part.string ?? part]));
  return { description: form.get?.('description'), file: form.get?.('file') };
}

beforeEach(() => {
  jest.clearAllMocks();
  answers = {};
  requests = [];
  global.fetch = jest.fn((url: string, init: { method?: string; body?: unknown } = {}) => {
    const method = init.method ?? 'GET';
    if (url.startsWith('file://')) return Promise.resolve({ ok: true, status: 200, arrayBuffer: async () => new TextEncoder().encode(fileContents[url]).buffer });
    const path = url.replace(/^\/api/, '');
    requests.push({ method, path, body: typeof init.body === 'string' ? JSON.parse(init.body) : init.body });
    const answer = answers[`${method} ${path}`] ?? { status: 404, body: { error: { code: 'not_found', message: 'No such thing' } } };
    return Promise.resolve({ ok: answer.status < 300, status: answer.status, json: async () => answer.body, text: async () => answer.text ?? '' });
  }) as unknown as typeof fetch;
});

const fileContents: Record<string, string> = {};

const writes = () => requests.filter((request) => request.method !== 'GET');
const paste = (text: string) => fireEvent.changeText(screen.getByTestId('dataset-paste'), text);
const type = (testID: string, text: string) => fireEvent.changeText(screen.getByTestId(testID), text);

// An invented boundary table, tab-separated, header plus 8 rows (the spline's minimum, DATASET_LIMITS.minKinkPoints).
const BOUNDARY_TSV = ['dphi\tbound\tlo\thi', ...Array.from({ length: 8 }, (_, i) => `0.5${i + 1}\t1.${i + 2}\t0.01\t0.02`)].join('\n');

describe('the upload form', () => {
  it('previews a pasted table at once: delimiter, header, rows and columns', async () => {
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor')} />);
    // Written by hand: a header line and 2 data lines of 3 comma-separated fields.
    paste('s,nu_inv,err\n1.60,1.412,0.010\n1.70,1.331,0.012');
    expect(await screen.findByTestId('dataset-preview-summary')).toHaveTextContent('2 rows · 3 columns separated by commas · the first row names the columns');
    const preview = screen.getByTestId('dataset-preview');
    for (const cell of ['s', 'nu_inv', 'err', '1.60', '1.331', '0.012']) expect(within(preview).getByText(cell)).toBeTruthy();
    // The same numbers separated by tabs are read as tab-separated.
    paste('1.60\t1.412\n1.70\t1.331\n1.80\t1.250');
    expect(await screen.findByTestId('dataset-preview-summary')).toHaveTextContent('3 rows · 2 columns separated by tabs · no header row');
    // Columns are offered by name, or by position without a header; nothing was sent for a preview.
    expect(screen.getByTestId('dataset-x-column-0')).toHaveTextContent('Column 1');
    expect(screen.getByTestId('dataset-y-column-1')).toHaveTextContent('Column 2');
    expect(requests).toHaveLength(0);
  });

  it('lists the rows it cannot read by line number before anything is sent', async () => {
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor')} />);
    // Line 3 holds a word where y should be a number (the header is line 1).
    paste('s,eta\n1.6,0.03\n1.7,abc\n1.8,0.05');
    expect(await screen.findByTestId('dataset-problem-3')).toHaveTextContent(/^Line 3, column eta: .*abc.* is not a number/);
    type('dataset-label', 'eta');
    type('dataset-name', 'Invented η');
    fireEvent.press(screen.getByTestId('dataset-submit'));
    expect(await screen.findByTestId('dataset-no-table')).toBeTruthy();
    expect(writes()).toHaveLength(0);
  });

  it('sends the mapping, axes, shape and description chosen in the form', async () => {
    answers[`POST /notebooks/${NB}/datasets/pasted`] = { status: 201, body: { dataset: boundary } };
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor')} />);
    paste(BOUNDARY_TSV);
    await screen.findByTestId('dataset-preview');
    fireEvent.press(screen.getByTestId('dataset-yerror-kind-asymmetric'));
    fireEvent.press(screen.getByTestId('dataset-yerror-lower-2'));
    fireEvent.press(screen.getByTestId('dataset-yerror-upper-3'));
    fireEvent.press(screen.getByTestId('dataset-x-axis-Delta_phi'));
    fireEvent.press(screen.getByTestId('dataset-y-axis-Delta_phi2'));
    fireEvent.press(screen.getByTestId('dataset-shape-boundary'));
    type('dataset-label', 'bound');
    type('dataset-name', 'Invented bound');
    type('dataset-source', 'Invented bootstrap, Λ = 27');
    fireEvent.press(screen.getByTestId('dataset-submit'));
    await waitFor(() => expect(writes()).toHaveLength(1));
    // The contract (shared/notebook/datasets.ts pastedDataset), written out by hand for this form.
    expect(writes()[0]).toEqual({
      method: 'POST',
      path: `/notebooks/${NB}/datasets/pasted`,
      body: {
        label: 'bound', name: 'Invented bound', source: 'Invented bootstrap, Λ = 27', note: '', shape: 'boundary',
        xAxis: { kind: 'Delta_phi' }, yAxis: { kind: 'Delta_phi2' },
        mapping: { x: 0, y: 1, yError: { kind: 'asymmetric', lower: 2, upper: 3 } },
        header: true,
        text: BOUNDARY_TSV,
      },
    });
    expect(await screen.findByTestId('dataset-added')).toHaveTextContent('Added Invented bound (bound).');
  });

  it('uploads a chosen file with its description as a JSON part, label and name taken from the file name', async () => {
    fileContents['file:///cache/Lattice-nu.csv'] = 's,nu,err\n1.6,0.71,0.02\n1.7,0.76,0.03';
    getDocumentAsync.mockResolvedValueOnce({ canceled: false, assets: [{ uri: 'file:///cache/Lattice-nu.csv', name: 'Lattice-nu.csv', size: 40, mimeType: 'text/csv' }] });
    answers[`POST /notebooks/${NB}/datasets`] = { status: 201, body: { dataset: { ...boundary, label: 'lattice_nu' } } };
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('owner')} />);
    fireEvent.press(screen.getByTestId('dataset-file-input'));
    expect(await screen.findByTestId('dataset-file-name')).toHaveTextContent('Lattice-nu.csv');
    await screen.findByTestId('dataset-preview');
    // Guessed from the column names: s, ν and an error column.
    expect(screen.getByTestId('dataset-x-axis-s')).toBeSelected();
    expect(screen.getByTestId('dataset-y-axis-nu')).toBeSelected();
    expect(screen.getByTestId('dataset-yerror-kind-symmetric')).toBeSelected();
    expect(screen.getByTestId('dataset-label').props.value).toBe('lattice_nu');
    expect(screen.getByTestId('dataset-name').props.value).toBe('Lattice nu');
    fireEvent.press(screen.getByTestId('dataset-submit'));
    await waitFor(() => expect(writes()).toHaveLength(1));
    expect(writes()[0].path).toBe(`/notebooks/${NB}/datasets`);
    const parts = formParts(writes()[0].body);
    expect(JSON.parse(String(parts.description))).toEqual({
      label: 'lattice_nu', name: 'Lattice nu', source: '', note: '', shape: 'points',
      xAxis: { kind: 's' }, yAxis: { kind: 'nu' },
      mapping: { x: 0, y: 1, yError: { kind: 'symmetric', column: 2 } },
      header: true,
    });
    expect(parts.file).toBeTruthy();
  });

  it('fills label and name from the next file chosen unless the person typed their own', async () => {
    fileContents['file:///cache/first.csv'] = 's,eta\n1.6,0.03\n1.7,0.04';
    fileContents['file:///cache/second.csv'] = 's,eta\n1.6,0.03\n1.7,0.05';
    const asset = (name: string) => ({ canceled: false, assets: [{ uri: `file:///cache/${name}`, name, size: 30, mimeType: 'text/csv' }] });
    getDocumentAsync.mockResolvedValueOnce(asset('first.csv')).mockResolvedValueOnce(asset('second.csv'));
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor', [{ ...boundary, label: 'second' }])} />);
    fireEvent.press(screen.getByTestId('dataset-file-input'));
    await screen.findByTestId('dataset-preview');
    expect(screen.getByTestId('dataset-label').props.value).toBe('first');
    type('dataset-name', 'My own name');
    fireEvent.press(screen.getByTestId('dataset-file-input'));
    await waitFor(() => expect(screen.getByTestId('dataset-file-name')).toHaveTextContent('second.csv'));
    // "second" is taken by a dataset of the notebook: numbered.
    expect(screen.getByTestId('dataset-label').props.value).toBe('second2');
    expect(screen.getByTestId('dataset-name').props.value).toBe('My own name');
  });

  it('refuses a file over 10 MB before reading or sending it, naming the limit', async () => {
    // DATASET_LIMITS.maxFileBytes is 10 MiB; one byte more.
    getDocumentAsync.mockResolvedValueOnce({ canceled: false, assets: [{ uri: 'file:///cache/huge.csv', name: 'huge.csv', size: 10 * 1024 * 1024 + 1, mimeType: 'text/csv' }] });
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor')} />);
    fireEvent.press(screen.getByTestId('dataset-file-input'));
    expect(await screen.findByTestId('dataset-file-refused')).toHaveTextContent('huge.csv is 10.0 MB; a dataset file may be at most 10 MB.');
    expect(screen.queryByTestId('dataset-file-name')).toBeNull();
    expect((global.fetch as jest.Mock).mock.calls).toHaveLength(0);
  });

  it('shows the rows the server refused by line, the first 50 and how many more, and keeps everything typed', async () => {
    const problems = Array.from({ length: 50 }, (_, i) => ({ line: i + 2, column: 'bound', reason: 'invented reason' }));
    answers[`POST /notebooks/${NB}/datasets/pasted`] = { status: 400, body: { error: { code: 'invalid_table', message: 'Some rows cannot be read.', problems, problemCount: 120 } } };
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor')} />);
    paste(BOUNDARY_TSV);
    await screen.findByTestId('dataset-preview');
    fireEvent.press(screen.getByTestId('dataset-shape-boundary'));
    type('dataset-label', 'bound');
    type('dataset-name', 'Invented bound');
    type('dataset-source', 'Invented source');
    type('dataset-note', 'Invented note');
    fireEvent.press(screen.getByTestId('dataset-submit'));
    const shown = await screen.findByTestId('dataset-problems');
    expect(within(shown).getByTestId('dataset-problem-2')).toHaveTextContent('Line 2, column bound: invented reason');
    expect(within(shown).getByTestId('dataset-problem-51')).toBeTruthy();
    // 120 problems in all, 50 listed: 70 more.
    expect(shown).toHaveTextContent(/and 70 more$/);
    expect(screen.getByTestId('dataset-paste').props.value).toBe(BOUNDARY_TSV);
    expect(screen.getByTestId('dataset-label').props.value).toBe('bound');
    expect(screen.getByTestId('dataset-name').props.value).toBe('Invented bound');
    expect(screen.getByTestId('dataset-source').props.value).toBe('Invented source');
    expect(screen.getByTestId('dataset-note').props.value).toBe('Invented note');
    expect(screen.getByTestId('dataset-shape-boundary')).toBeSelected();
  });

  it('asks for a label and a name before sending', async () => {
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor')} />);
    paste('s,eta\n1.6,0.03\n1.7,0.04');
    await screen.findByTestId('dataset-preview');
    type('dataset-label', 'Eta data');
    fireEvent.press(screen.getByTestId('dataset-submit'));
    expect(await screen.findByTestId('dataset-label-error')).toHaveTextContent(/^A label is a lower-case word/);
    expect(screen.getByTestId('dataset-name-error')).toHaveTextContent(/^Give the dataset a name/);
    expect(writes()).toHaveLength(0);
  });
});

describe('the list of datasets', () => {
  it('shows viewers the datasets and the download, but no upload, removal or comparison', async () => {
    answers[`GET /notebooks/${NB}/datasets/${boundary.id}/download.csv`] = { status: 200, body: null, text: 'x,y\r\n0.51,1.2\r\n' };
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('viewer', [boundary])} />);
    const row = screen.getByTestId('dataset-bound');
    expect(row).toHaveTextContent(/Invented bound on Δφ²/);
    expect(within(row).getAllByTestId('tex').map((node) => node.props.children)).toEqual(['\\Delta_{\\phi^2}', '\\Delta_\\phi']);
    expect(row).toHaveTextContent(/40 rows · x from 0.51 to 0.58/);
    expect(row).toHaveTextContent(/Added by Invented Lead/);
    for (const absent of ['dataset-file-input', 'dataset-paste', 'dataset-submit', 'dataset-bound-remove', 'dataset-bound-compare']) expect(screen.queryByTestId(absent)).toBeNull();
    fireEvent.press(screen.getByTestId('dataset-bound-download'));
    await waitFor(() => expect(saveTextFile).toHaveBeenCalledWith('bound.csv', 'x,y\r\n0.51,1.2\r\n', 'text/csv'));
  });

  it('removes a dataset only after the editor confirms', async () => {
    answers[`DELETE /notebooks/${NB}/datasets/${boundary.id}`] = { status: 200, body: { notebook: notebookAs('editor') } };
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor', [boundary])} />);
    fireEvent.press(screen.getByTestId('dataset-bound-remove'));
    expect(screen.getByTestId('dataset-bound-remove-question')).toHaveTextContent(/Remove Invented bound on Δφ² from the notebook\?/);
    expect(writes()).toHaveLength(0);
    fireEvent.press(screen.getByTestId('dataset-bound-remove-cancel'));
    expect(screen.queryByTestId('dataset-bound-remove-question')).toBeNull();
    expect(writes()).toHaveLength(0);
    fireEvent.press(screen.getByTestId('dataset-bound-remove'));
    fireEvent.press(screen.getByTestId('dataset-bound-remove-confirm'));
    await waitFor(() => expect(writes()).toEqual([{ method: 'DELETE', path: `/notebooks/${NB}/datasets/${boundary.id}`, body: undefined }]));
  });

  it('adds a comparison cell on the first scan, looking for kinks in a boundary curve', async () => {
    const created = { ...scanCell, id: 'cellcomp00001', label: 'comparison', kind: 'comparison' as const, input: { kind: 'comparison' as const, uses: 'scan', dataset: 'bound', kinks: true } };
    answers[`POST /notebooks/${NB}/cells`] = { status: 201, body: { notebook: notebookAs('editor', [boundary], [scanCell, created]) } };
    const onCellAdded = jest.fn();
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor', [boundary])} onCellAdded={onCellAdded} />);
    fireEvent.press(screen.getByTestId('dataset-bound-compare'));
    await waitFor(() => expect(onCellAdded).toHaveBeenCalledWith('cellcomp00001'));
    expect(writes()).toEqual([{ method: 'POST', path: `/notebooks/${NB}/cells`, body: { label: 'comparison', input: { kind: 'comparison', uses: 'scan', dataset: 'bound', kinks: true } } }]);
  });

  it('says so when there is no scan to compare with', () => {
    renderWithQueryClient(<DatasetPanel notebook={notebookAs('editor', [boundary], [])} />);
    fireEvent.press(screen.getByTestId('dataset-bound-compare'));
    expect(screen.getByTestId('dataset-bound-message')).toHaveTextContent(/no scan over s yet/);
    expect(writes()).toHaveLength(0);
  });
});
