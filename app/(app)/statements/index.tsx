import { useState } from 'react';
import { Text, View } from 'react-native';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { Choices } from '@/components/Choices';
import { CautionNotice } from '@/components/CautionNotice';
import { DownloadLink } from '@/components/DownloadLink';
import { ProgressBar } from '@/components/ProgressBar';
import { colors, radius, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { exportFileUrl, statementFileUrl, useStartExport, useStatementExports, useStatementPreview, useStatementSources, type StatementText } from '@/hooks/useStatements';
import { count, dateTime } from '@/figures';

export default function Statements() {
  const { scheme, can } = useCurrentScheme();
  if (!scheme) return <Loading />;
  if (!can('statements:export')) {
    return (
      <Screen title="Member statements">
        <Notice>Member statements are prepared by the communications officer.</Notice>
      </Screen>
    );
  }
  return <StatementsScreen schemeId={scheme.id} />;
}

function StatementsScreen({ schemeId }: { schemeId: string }) {
  const sources = useStatementSources(schemeId);
  const [pickedRun, setRunId] = useState<string | null>(null);
  const [pickedOption, setOptionId] = useState<string | null>(null);
  const [pickedMember, setMemberId] = useState<string | null>(null);
  // Until something is picked (or when a pick no longer fits the run), the first choice applies.
  const run = sources.data?.runs.find((r) => r.id === pickedRun) ?? sources.data?.runs[0] ?? null;
  const runId = run?.id ?? null;
  const optionId = run?.options.some((o) => o.id === pickedOption) ? pickedOption : (run?.options[0]?.id ?? null);
  const memberId = run?.members.some((m) => m.id === pickedMember) ? pickedMember : (run?.members[0]?.id ?? null);
  const choice = runId && optionId && memberId ? { runId, optionId, memberId } : null;
  const preview = useStatementPreview(schemeId, choice);
  return (
    <Screen title="Member statements" subtitle="Plain-language projections for members, from a finished run. Check the wording, then download.">
      {sources.isLoading ? <Loading /> : null}
      {sources.error ? <Notice tone="error">{sources.error.message}</Notice> : null}
      {sources.data && !sources.data.runs.length ? <Notice>No finished projection runs yet. A trustee or the actuary runs projections first.</Notice> : null}
      {run ? (
        <Card title="Choose">
          <Choices
            label="Run"
            value={runId}
            onChange={setRunId}
            options={sources.data!.runs.slice(0, 6).map((r) => ({ value: r.id, label: `${dateTime(r.finishedAt)} · set v${r.assumptionSetVersion}${r.draft ? ' DRAFT' : ''}`, hint: `${count(r.paths)} paths` }))}
          />
          <Choices label="Default option" value={optionId} onChange={setOptionId} options={run.options.map((o) => ({ value: o.id, label: o.name }))} />
          <Choices label="Illustrative member" value={memberId} onChange={setMemberId} options={run.members.map((m) => ({ value: m.id, label: m.label, hint: `age ${m.age}, retires at ${m.retirementAge}` }))} testID="member-choice" />
        </Card>
      ) : null}
      {preview.isLoading && choice ? <Loading label="Preparing the wording…" /> : null}
      {preview.error ? <Notice tone="error">{preview.error.message}</Notice> : null}
      {preview.data && choice ? (
        <>
          <StatementPreview text={preview.data.text} draft={preview.data.figures.draft} />
          <Card title="Download this statement">
            <View style={styles.row}>
              <DownloadLink href={statementFileUrl(schemeId, choice, 'pdf')} label="Statement PDF" testID="statement-pdf" />
              <DownloadLink href={statementFileUrl(schemeId, choice, 'csv')} label="Figures as CSV" />
            </View>
          </Card>
        </>
      ) : null}
      {run && optionId ? <BulkExports schemeId={schemeId} runId={run.id} optionId={optionId} membershipCount={sources.data!.membershipCount} illustrativeCount={run.members.length} /> : null}
      <CautionNotice draft={run?.draft} />
    </Screen>
  );
}

/** The statement as the member will read it. */
function StatementPreview({ text, draft }: { text: StatementText; draft: boolean }) {
  const para = (s: string) => (
    <Text key={s} style={[type.body, { color: colors.ink }]}>
      {s}
    </Text>
  );
  const head = (s: string) => <Text style={[type.title, { color: colors.primary, marginTop: space.sm }]}>{s}</Text>;
  return (
    <Card title="Preview" style={{ borderColor: colors.primary }}>
      <View testID="statement-preview" style={{ gap: space.sm, maxWidth: 680 }}>
        <Text accessibilityRole="header" style={[type.heading, { color: colors.ink, fontSize: 24, lineHeight: 30 }]}>
          {text.title}
        </Text>
        {text.intro.map(para)}
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
          {text.cases.map((c) => (
            <View key={c.key} style={{ flexGrow: 1, flexBasis: 150, padding: space.md, borderRadius: radius.md, backgroundColor: c.key === 'typical' ? colors.accentTint : colors.primaryTint }}>
              <Text style={[type.label, { color: colors.mutedInk }]}>{c.label}</Text>
              <Text style={[type.heading, { color: colors.ink, fontVariant: ['tabular-nums'] }]}>{c.pot}</Text>
              <Text style={[type.caption, { color: colors.ink }]}>about {c.income} a year</Text>
            </View>
          ))}
        </View>
        {text.cases.map((c) => para(c.sentence))}
        {head('The income it could buy')}
        {text.income.map(para)}
        {head('What would change it')}
        {text.changes.map(para)}
        {head('About these figures')}
        {text.notes.map((s) => (
          <Text key={s} style={[type.caption, { color: colors.mutedInk }]}>
            {s}
          </Text>
        ))}
        <View style={{ borderWidth: 1, borderColor: draft ? colors.danger : colors.accent, borderRadius: radius.md, padding: space.md, gap: space.xs, backgroundColor: draft ? colors.dangerTint : colors.accentTint }}>
          {text.caution.map((s) => (
            <Text key={s} style={[type.caption, { color: colors.ink }]}>
              {s}
            </Text>
          ))}
        </View>
      </View>
    </Card>
  );
}

function BulkExports({ schemeId, runId, optionId, membershipCount, illustrativeCount }: { schemeId: string; runId: string; optionId: string; membershipCount: number; illustrativeCount: number }) {
  const exports = useStatementExports(schemeId);
  const start = useStartExport(schemeId);
  const [scope, setScope] = useState<'membership' | 'illustrative'>(membershipCount ? 'membership' : 'illustrative');
  const [format, setFormat] = useState<'pdf' | 'csv'>('pdf');
  return (
    <Card title="Statements for many members">
      <Text style={styles.muted}>Made in the background. One PDF with a page per member, or one CSV with a row per member. The file is offered here when ready.</Text>
      <Choices
        label="Members"
        value={scope}
        onChange={setScope}
        options={[
          { value: 'membership', label: `Whole membership (${membershipCount})` },
          { value: 'illustrative', label: `Illustrative members (${illustrativeCount})` },
        ]}
      />
      <Choices label="File" value={format} onChange={setFormat} options={[{ value: 'pdf', label: 'PDF' }, { value: 'csv', label: 'CSV' }]} />
      {start.error ? <Notice tone="error">{start.error.message}</Notice> : null}
      <View style={styles.row}>
        <Button label="Start export" onPress={() => start.mutate({ runId, optionId, scope, format })} busy={start.isPending} disabled={scope === 'membership' && !membershipCount} testID="start-export" />
      </View>
      {exports.data?.exports.slice(0, 8).map((e) => (
        <View key={e.id} style={{ borderTopWidth: 1, borderColor: colors.rule, paddingTop: space.sm, gap: space.xs }}>
          <Text style={[type.label, { color: colors.ink }]}>
            {e.scope === 'membership' ? 'Whole membership' : 'Illustrative members'} · {e.format.toUpperCase()} · {e.memberCount} members
          </Text>
          {e.status === 'queued' || e.status === 'running' ? <ProgressBar fraction={e.progress} label={e.status === 'queued' ? 'Waiting to start' : 'Projecting members'} /> : null}
          {e.status === 'failed' ? <Notice tone="error">{`This export failed: ${e.error ?? 'no reason given'}`}</Notice> : null}
          {e.status === 'done' ? <DownloadLink href={exportFileUrl(schemeId, e.id)} label={`Download ${e.filename ?? 'file'}`} /> : null}
        </View>
      ))}
    </Card>
  );
}
