// Invented datasets written straight into the database, for tests of the limits on stored points: the
// upload path is tested elsewhere; here only the sizes matter. All values are invented test data.
import type { DataSource } from 'typeorm';
import { Dataset } from '../../server/db/entities';
import { newId } from '../../server/ids';
import { datasetHash } from '../../server/jobs/documentWorker';
import type { DatasetPoints } from '../../shared/notebook/datasets';

/**
 * Valid points (x strictly increasing, plain decimals) whose JSON text is exactly `chars` characters:
 * rows of x = 1 + i·10⁻⁶ (6 decimals) and y = 0.5 + i·10⁻⁷ (12 decimals); the last y values are padded with zeros.
 */
export function pointsOfLength(chars: number): { points: DatasetPoints; json: string } {
  // each row adds "1.000000", (11 characters) and "0.500000000000", (17 characters)
  const rows = Math.floor((chars - 40) / 28);
  const x = Array.from({ length: rows }, (_v, i) => (1 + i * 1e-6).toFixed(6));
  const y = Array.from({ length: rows }, (_v, i) => (0.5 + i * 1e-7).toFixed(12));
  const shortBy = chars - JSON.stringify({ x, y }).length;
  if (shortBy < 0) throw new Error(`cannot make points of ${chars} characters`);
  // trailing zeros, at most 20 on each of the last values (an exchange file takes values of up to 60 characters)
  for (let left = shortBy, row = rows - 1; left > 0; left -= 20, row -= 1) y[row] += '0'.repeat(Math.min(20, left));
  const json = JSON.stringify({ x, y });
  if (json.length !== chars) throw new Error(`points of ${json.length} characters, not ${chars}`);
  return { points: { x, y }, json };
}

/** A dataset row with these points (x = s, y = Δφ², no errors); `removed` as a dataset only versions hold. */
export async function insertInventedDataset(
  dataSource: DataSource,
  row: { notebookId: string; label: string; createdById: string; points: DatasetPoints; json: string; removed?: boolean },
): Promise<string> {
  const id = newId();
  const axes = { shape: 'points', xAxis: { kind: 's' as const }, yAxis: { kind: 'Delta_phi2' as const } };
  let [low, high] = [0, 0];
  row.points.y.forEach((value, i) => {
    if (Number(value) < Number(row.points.y[low])) low = i;
    if (Number(value) > Number(row.points.y[high])) high = i;
  });
  await dataSource.getRepository(Dataset).insert({
    id,
    notebookId: row.notebookId,
    label: row.label,
    name: `Invented ${row.label}`,
    source: 'invented for tests',
    note: '',
    shape: axes.shape,
    xAxisJson: JSON.stringify(axes.xAxis),
    yAxisJson: JSON.stringify(axes.yAxis),
    yErrors: 'none',
    xErrors: false,
    rowCount: row.points.x.length,
    rangesJson: JSON.stringify({ x: [row.points.x[0], row.points.x[row.points.x.length - 1]], y: [row.points.y[low], row.points.y[high]] }),
    fileName: null,
    pointsJson: row.json,
    contentHash: datasetHash(row.json, axes),
    createdById: row.createdById,
    createdByName: 'Invented',
    removedAt: row.removed ? new Date() : null,
  });
  return id;
}
