import { Text, View } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { CautionNotice } from '@/components/CautionNotice';
import { DataTable, type Column } from '@/components/DataTable';
import { DownloadLink } from '@/components/DownloadLink';
import { colors, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { reportFileUrl, useEmailReport, useReport, type ReportComparisonRow } from '@/hooks/useReports';

const ordinal = (n: number) => (n === 50 ? 'Median' : `${n}${n % 10 === 1 && n !== 11 ? 'st' : n % 10 === 2 && n !== 12 ? 'nd' : n % 10 === 3 && n !== 13 ? 'rd' : 'th'}`);

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
    ...c.percentiles.map((p): Column<ReportComparisonRow> => ({ key: `p${p}`, title: ordinal(p), align: 'right', width: 96, render: (x) => x.display.percentilesReal[`p${p}`] })),
  ];
  const riskColumns: Column<ReportComparisonRow>[] = [
    { key: 'option', title: 'Option', width: 170, render: (x) => x.optionName },
    { key: 'mean', title: 'Mean', align: 'right', width: 100, render: (x) => x.display.meanReal },
    { key: 'target', title: 'Chance of target', align: 'right', width: 90, render: (x) => x.display.probabilityReachingTarget },
    { key: 'worst', title: 'Average of worst 5%', align: 'right', width: 110, render: (x) => x.display.expectedShortfallReal },
    { key: 'income', title: 'Median income a year', align: 'right', width: 110, render: (x) => x.display.medianRealIncome },
    { key: 'ce', title: `CE pot (λ = ${c.lambdaDisplay})`, align: 'right', width: 110, render: (x) => x.display.certaintyEquivalentPot },
    { key: 'cer', title: 'CE return a year', align: 'right', width: 90, render: (x) => x.display.certaintyEquivalentReturn },
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
      <CautionNotice draft={c.draft} />
      {members.map((m) => {
        const rows = c.comparison.filter((x) => x.memberId === m);
        return (
          <Card key={m} title={`${rows[0].memberLabel}: pot at retirement in today's money`}>
            <DataTable label={`Percentiles for ${rows[0].memberLabel}`} columns={pctColumns} rows={rows} rowKey={(x) => x.optionId} />
            <View style={{ height: space.md }} />
            <DataTable label={`Risk measures for ${rows[0].memberLabel}`} columns={riskColumns} rows={rows} rowKey={(x) => x.optionId} />
          </Card>
        );
      })}
      {c.breakEven.length ? (
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
