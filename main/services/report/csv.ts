/** The margin CSV as text (csv-stringify): header row with units, one row per net. */
import { stringify } from 'csv-stringify/sync';
import { MARGIN_CSV_COLUMNS, type MarginCsvRecord } from '../../../core/report/csv.js';

export function renderMarginCsv(records: MarginCsvRecord[]): string {
  return stringify(records, { header: true, columns: [...MARGIN_CSV_COLUMNS] });
}
