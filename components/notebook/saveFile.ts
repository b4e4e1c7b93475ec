import { Share } from 'react-native';

/** Native: hand the text to the share sheet, from where it can be saved or sent. */
export async function saveTextFile(fileName: string, text: string, _mimeType: string): Promise<void> {
  await Share.share({ title: fileName, message: text });
}
