import { Share } from 'react-native';

/** Native: no clipboard module ships with the app, so the share sheet carries the text (it offers "Copy"). */
export async function copyText(text: string): Promise<boolean> {
  try {
    await Share.share({ message: text });
    return true;
  } catch {
    return false;
  }
}
