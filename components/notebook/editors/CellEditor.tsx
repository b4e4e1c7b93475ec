import type { CellInput, DatasetView } from '../../../shared/notebook';
import { ComparisonEditor } from './ComparisonEditor';
import { IntegralEditor } from './IntegralEditor';
import { NoteEditor } from './NoteEditor';
import { ReferenceEditor } from './ReferenceEditor';
import { ScanEditor } from './ScanEditor';
import { SetupEditor } from './SetupEditor';
import type { EditorProps } from './fields';

/** The input form for a cell, by its kind. */
export function CellEditor({ input, scanLabels, datasets, ...props }: EditorProps<CellInput> & {
  /** Labels of the notebook's scan cells (a comparison picks one). */
  scanLabels?: string[];
  /** The notebook's datasets (a comparison picks one). */
  datasets?: DatasetView[];
}) {
  switch (input.kind) {
    case 'note':
      return <NoteEditor input={input} {...props} />;
    case 'setup':
      return <SetupEditor input={input} {...props} />;
    case 'integral':
      return <IntegralEditor input={input} {...props} />;
    case 'flow':
    case 'fixedpoints':
    case 'exponents':
      return <ReferenceEditor input={input} {...props} />;
    case 'scan':
      return <ScanEditor input={input} {...props} />;
    case 'comparison':
      return <ComparisonEditor input={input} scanLabels={scanLabels} datasets={datasets} {...props} />;
  }
}
