import { getDocumentAsync } from 'expo-document-picker';
import { ChipButton } from '../notebook/ChipButton';
import { ACCEPTED_TYPES, fileSizeProblem, type FileChooserProps } from './chosenFile';

/** Native: the system document picker; the text is read from the copy it makes. */
export function FileChooser({ onChosen, onRefused, disabled }: FileChooserProps) {
  const choose = async () => {
    const result = await getDocumentAsync({ type: ACCEPTED_TYPES, copyToCacheDirectory: true });
    const asset = result.canceled ? null : result.assets[0];
    if (!asset) return;
    const problem = fileSizeProblem(asset.name, asset.size ?? 1);
    if (problem) return onRefused(problem);
    const type = asset.mimeType ?? 'text/csv';
    onChosen({
      name: asset.name,
      size: asset.size ?? 0,
      part: { uri: asset.uri, name: asset.name, type },
      read: async () => new Uint8Array(await (await fetch(asset.uri)).arrayBuffer()),
    });
  };
  return <ChipButton label="Choose a file" disabled={disabled} onPress={() => void choose()} testID="dataset-file-input" accessibilityLabel="Choose a CSV or TSV file" />;
}
