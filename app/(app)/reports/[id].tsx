import { Text, View } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { CautionNotice } from '@/components/CautionNotice';
import { DataTable, type Column } from '@/components/DataTable';
import { DownloadLink } from '@/components/DownloadLink';
import { colors, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { comparisonColumns, percentileLabel, STRESS_COLUMNS, type StressKey } from '@/figures';
import { BreakEvenTable } from '@/components/BreakEvenTable';
import { DifferenceTable } from '@/components/DifferenceTable';
import { reportFileUrl, useEmailReport, useReport, type ReportComparisonRow } from '@/hooks/useReports';


export default function ReportView() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const { scheme, can } = useCurrentScheme();
  const report = useReport(scheme?.id, id);
  const email = useEmailReport(scheme?.id ?? '');
  if (!scheme || report.isLoading) return <Loading />;
  if (report.error) {
    return (
      <Screen title="Board report">
        <Notice tone="error">{report.error.message}</Notice>
      </Screen>
    );
  }
  const r = report.data!;
  const c = r.content;
  const members = [...new Set(c.comparison.map((x) => x.memberId))];
  const pctColumns: Column<ReportComparisonRow>[] = [
    { key: 'option', title: 'Option', width: 170, render: (x) => x.optionName },
    ...c.percentiles.map((p): Column<ReportComparisonRow> => ({ key: `p${p}`, title: percentileLabel(p), align: 'right', width: 96, render: (x) => x.display.percentilesReal[`p${p}`] })),
  ];
  // The report's own headings as printed (reports made before they were stored use today's).
  const riskColumns: Column<ReportComparisonRow>[] = [
    { key: 'option', title: 'Rank and option', width: 170, render: (x) => (x.rank ? `${x.rank}. ${x.optionName}` : x.optionName) },
    ...(c.columns ?? comparisonColumns(c.lambda)).map((col): Column<ReportComparisonRow> => ({
      key: col.key,
      title: col.label,
      align: 'right',
      width: 120,
      render: (x) => (x.standardErrors?.[col.key] ? `${x.display[col.key] ?? '—'}\n${x.standardErrors[col.key]}` : (x.display[col.key] ?? '—')),
    })),
  ];
  return (
    <Screen title={r.title} subtitle={`${c.schemeName} · ${c.createdOn}${r.createdBy ? ` · by ${r.createdBy}` : ''}`}>
      {c.draft && c.draftText ? <Notice tone="error">{c.draftText}</Notice> : null}
      <Card title="This report">
        <Text style={styles.body}>Projection run {c.runId}</Text>
        <Text style={styles.body}>
          Assumption set version {c.assumptionSet.version} ({c.assumptionSet.status === 'approved' ? 'approved' : 'DRAFT'}), set on {c.assumptionSet.setAt}
          {c.assumptionSet.approvedBy ? `, approved by ${c.assumptionSet.approvedBy}` : ''}
          {c.assumptionSet.approvedOn ? ` on ${c.assumptionSet.approvedOn}` : ''}
        </Text>
        <Text style={styles.body}>Certainty equivalents at risk aversion λ = {c.lambdaDisplay}</Text>
        <View style={[styles.row, { marginTop: space.sm }]}>
          <DownloadLink href={reportFileUrl(scheme.id, r.id, 'pdf')} label="Download PDF" testID="report-pdf" />
          <DownloadLink href={reportFileUrl(scheme.id, r.id, 'comparison.csv')} label="Comparison as CSV" />
          {can('reports:create') ? <Button label="E-mail to board reviewers" onPress={() => email.mutate(r.id)} busy={email.isPending} disabled={email.isSuccess} /> : null}
        </View>
        {email.data ? <Notice tone="success">{`Queued for ${email.data.recipients.join(', ')}. The administrator's outbox shows when it is delivered.`}</Notice> : null}
        {email.error ? <Notice tone="error">{email.error.message}</Notice> : null}
      </Card>
      {c.summary ? (
        <Card title="Summary">
          <View testID="report-summary" style={{ gap: space.xs }}>
            <Text style={styles.body}>{c.summary.question}</Text>
            <Text style={styles.body}>Options: {c.summary.options.join('; ')}.</Text>
            <Text style={styles.muted}>{c.summary.baseline}</Text>
            <Text style={[type.label, { color: colors.ink }]}>Key figures</Text>
            {c.summary.keyFigures.map((k) => (
              <Text key={k} style={styles.body}>
                {k}
              </Text>
            ))}
            {c.summary.stress ? (
              <>
                <Text style={[type.label, { color: colors.ink }]}>Under stress: {c.summary.stress.description}</Text>
                {c.summary.stress.sentences.map((k) => (
                  <Text key={k} style={styles.body}>
                    {k}
                  </Text>
                ))}
              </>
            ) : null}
            <Text style={[type.label, { color: colors.ink }]}>Decision</Text>
            <Text style={styles.body}>{c.summary.decision}</Text>
            {c.summary.cautions.map((k) => (
              <Text key={k} style={styles.muted}>
                {k}
              </Text>
            ))}
          </View>
        </Card>
      ) : null}
      <CautionNotice draft={c.draft} />
      {c.baseline ? (
        <Text style={styles.muted} testID="report-baseline">
          {c.baseline}
        </Text>
      ) : null}
      {members.map((m) => {
        const rows = c.comparison.filter((x) => x.memberId === m);
        const ranking = c.ranking?.find((x) => x.memberId === m);
        const table = c.differenceTables?.find((x) => x.memberId === m);
        return (
          <Card key={m} title={`${rows[0].memberLabel}: pot at retirement in today's money`}>
            <DataTable label={`Percentiles for ${rows[0].memberLabel}`} columns={pctColumns} rows={rows} rowKey={(x) => x.optionId} />
            <View style={{ height: space.md }} />
            <DataTable label={`Risk measures for ${rows[0].memberLabel}`} columns={riskColumns} rows={rows} rowKey={(x) => x.optionId} />
            {ranking?.lead ? <Text style={[styles.body, { fontFamily: type.label.fontFamily }]}>{ranking.lead}</Text> : null}
            {(ranking?.tooClose ?? []).map((t) => (
              <Text key={t} style={styles.body} testID="too-close">
                {t}
              </Text>
            ))}
            {table ? (
              <DifferenceTable rows={table.rows} baselineName={table.baselineName} testID={`differences-${m}`} />
            ) : (
              (c.differences?.find((d) => d.memberId === m)?.sentences ?? []).map((d) => (
                <Text key={d} style={styles.body}>
                  {d}
                </Text>
              ))
            )}
          </Card>
        );
      })}
      {c.stressed ? (
        <Card title={`Under stress: ${c.stressed.description}`}>
          <View testID="report-stressed" style={{ gap: space.md }}>
            {c.stressed.members.map((m) => (
              <View key={m.memberId} style={{ gap: space.xs }}>
                <Text style={[type.label, { color: colors.ink }]}>{m.memberLabel}</Text>
                <DataTable
                  label={`Figures without and with the stress for ${m.memberLabel}`}
                  columns={STRESS_COLUMNS.map((col): Column<Record<StressKey, string>> => ({ key: col.key, title: col.label, align: col.key === 'option' ? 'left' : 'right', width: col.key === 'option' ? 170 : 150, render: (x) => x[col.key] }))}
                  rows={m.rows}
                  rowKey={(x) => x.option}
                />
                {m.lead ? <Text style={styles.body}>{m.lead}</Text> : null}
              </View>
            ))}
          </View>
        </Card>
      ) : null}
      {c.breakEvenTable?.length ? (
        <Card title="Where the board's risk appetite changes the order">
          <BreakEvenTable rows={c.breakEvenTable} />
        </Card>
      ) : c.breakEven.length ? (
        <Card title="Where the board's risk appetite changes the choice">
          {c.breakEven.map((s) => (
            <Text key={s} style={styles.body}>
              {s}
            </Text>
          ))}
        </Card>
      ) : null}
      <Card title="Monte Carlo details">
        {c.monteCarlo.lines.map((l) => (
          <Text key={l} style={[type.body, { color: colors.ink }]}>
            {l}
          </Text>
        ))}
        <Text style={styles.muted}>Fan charts, glide paths and standard errors are in the PDF.</Text>
      </Card>
    </Screen>
  );
}
