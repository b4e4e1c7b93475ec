import { useEffect, useState } from 'react';
import { StyleSheet, Text } from 'react-native';
import { colors, fonts } from '../../../constants/theme';
import { TextField } from '../../ui/TextField';
import { ChoiceRow } from '../ChoiceRow';
import { wholeNumber } from '../fieldErrors';

export interface EditorProps<Input> {
  input: Input;
  errors: Record<string, string>;
  onChange: (input: Input) => void;
  /** Labels of the notebook's model & parameters cells. */
  setupLabels: string[];
  /** Prefix of every field's testID, e.g. "cell-flow". */
  testPrefix: string;
  /** The saved d of each model & parameters cell, by label (a scan states its window of s). */
  setupDimensions?: ReadonlyMap<string, string | undefined>;
}

interface NumberFieldProps {
  label: string;
  value: number | string;
  onChange: (value: number | string) => void;
  error?: string;
  hint?: string;
  testID?: string;
  /** A symbol accepted in place of a number, e.g. "N". */
  allowSymbol?: string;
}

/** A whole-number field that keeps what was typed (even half-typed) while the input holds a number. */
export function WholeNumberField(props: NumberFieldProps) {
  return <TypedNumberField {...props} read={wholeNumber} keyboardType={props.allowSymbol ? 'default' : 'number-pad'} />;
}

/**
 * The N of a preset: any real number. A whole number is kept as a number, anything else as the typed
 * text (a decimal, read exactly by the engine; the schema names what is wrong with other text).
 */
export function PresetNField(props: NumberFieldProps) {
  return <TypedNumberField {...props} read={presetNumber} keyboardType={props.allowSymbol ? 'default' : 'numbers-and-punctuation'} />;
}

export function presetNumber(typed: string): number | string {
  const text = typed.trim();
  return /^-?\d+$/.test(text) ? Number(text) : text;
}

function TypedNumberField({ label, value, onChange, error, hint, testID, allowSymbol, read, keyboardType }: NumberFieldProps & {
  read: (typed: string) => number | string;
  keyboardType: 'default' | 'number-pad' | 'numbers-and-punctuation';
}) {
  const [text, setText] = useState(String(value));
  const parse = (typed: string) => (allowSymbol && typed.trim() === allowSymbol ? allowSymbol : read(typed));
  useEffect(() => {
    const parsed = parse(text);
    if (parsed !== value && !(Number.isNaN(parsed) && Number.isNaN(value))) setText(String(value));
    // Only a change from outside (reload, another preset) should overwrite the typed text.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);
  return (
    <TextField
      label={label}
      value={text}
      onChangeText={(typed) => {
        setText(typed);
        onChange(parse(typed));
      }}
      keyboardType={keyboardType}
      error={error}
      hint={hint}
      testID={testID}
    />
  );
}

/** Text for an optional field: an empty box means "not given". */
export const optionalText = (text: string) => (text.trim() === '' ? undefined : text);

export function SetupChoice({ value, setupLabels, onChange, error, testID, optional = false }: {
  value: string | undefined;
  setupLabels: string[];
  onChange: (label: string | undefined) => void;
  error?: string;
  testID: string;
  optional?: boolean;
}) {
  if (setupLabels.length === 0 && !optional) {
    return <TextField label="Uses the model & parameters cell" value={value ?? ''} onChangeText={onChange} error={error ?? 'Add a model & parameters cell first'} testID={testID} />;
  }
  const options = [...(optional ? [{ value: '', label: 'none' }] : []), ...setupLabels.map((label) => ({ value: label, label }))];
  if (value && !setupLabels.includes(value)) options.push({ value, label: `${value} (missing)` });
  return (
    <>
      <ChoiceRow label="Uses the model & parameters cell" options={options} value={value ?? ''} onChange={(label) => onChange(label || undefined)} testID={testID} />
      {error ? <FieldError message={error} testID={`${testID}-error`} /> : null}
    </>
  );
}

export function FieldError({ message, testID }: { message: string; testID?: string }) {
  return (
    <Text style={styles.error} accessibilityRole="alert" testID={testID}>
      {message}
    </Text>
  );
}

const styles = StyleSheet.create({ error: { fontFamily: fonts.regular, fontSize: 13, color: colors.danger } });
