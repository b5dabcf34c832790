import { useState } from 'react';
import { Text, View } from 'react-native';
import * as DocumentPicker from 'expo-document-picker';
import { colors, space, type } from '@/constants/theme';
import type { PickedFile } from '@/hooks/upload';
import { Button, Notice } from './ui';

type Props = {
  label: string;
  onFile: (file: PickedFile) => void;
  busy?: boolean;
  hint?: string;
  testID?: string;
};

/** Picks one .csv file (on the web, the browser's file dialog) and hands it on. */
export function FileUpload({ label, onFile, busy, hint, testID }: Props) {
  const [name, setName] = useState<string | null>(null);
  const pick = async () => {
    const r = await DocumentPicker.getDocumentAsync({ type: ['text/csv', '.csv', 'text/comma-separated-values', 'application/vnd.ms-excel'], multiple: false, copyToCacheDirectory: false });
    if (r.canceled || !r.assets?.[0]) return;
    const a = r.assets[0];
    setName(a.name);
    onFile({ name: a.name, uri: a.uri, mimeType: a.mimeType, file: a.file });
  };
  return (
    <View style={{ gap: space.sm }}>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md }}>
        <Button label={label} onPress={pick} busy={busy} testID={testID} kind="secondary" />
        {name ? <Text style={[type.caption, { color: colors.mutedInk }]}>{name}</Text> : null}
      </View>
      {hint ? <Text style={[type.caption, { color: colors.mutedInk }]}>{hint}</Text> : null}
    </View>
  );
}

type Problem = { path: string; message: string; line?: number; column?: string };

/** An upload's rejection (the API client's error, with its issues): the summary, then each bad line with its column and reason. */
export function UploadProblems({ error }: { error: unknown }) {
  if (!error) return null;
  const message = error instanceof Error ? error.message : String(error);
  const issues = ((error as { issues?: Problem[] }).issues ?? []) as Problem[];
  return (
    <Notice tone="error">
      <View style={{ gap: 4 }} testID="upload-problems">
        <Text style={[type.label, { color: colors.danger }]}>{message}</Text>
        {issues.map((p, k) => (
          <Text key={k} style={[type.caption, { color: colors.ink }]}>
            {p.line !== undefined ? `Line ${p.line}${p.column ? `, ${p.column}` : ''}` : p.path}: {p.message}
          </Text>
        ))}
      </View>
    </Notice>
  );
}
