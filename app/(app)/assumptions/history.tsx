import { useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { useRouter } from 'expo-router';
import { Button, Card, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { FileUpload, UploadProblems } from '@/components/FileUpload';
import { GrowthChart } from '@/components/GrowthChart';
import { CorrelationEditor } from '@/components/CorrelationEditor';
import { date, percent } from '@/figures';
import { colors, MIN_TOUCH, radius, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useAdoptSuggestion, useAssumptionSets, useHistorySuggestion } from '@/hooks/useAssumptions';

function Check({ on, label, onPress }: { on: boolean; label: string; onPress: () => void }) {
  return (
    <Pressable accessibilityRole="checkbox" accessibilityState={{ checked: on }} accessibilityLabel={label} onPress={onPress} style={{ minHeight: MIN_TOUCH, minWidth: MIN_TOUCH, justifyContent: 'center', alignItems: 'center' }}>
      <View style={{ width: 22, height: 22, borderRadius: radius.sm, borderWidth: 2, borderColor: colors.primary, backgroundColor: on ? colors.primary : colors.surface, alignItems: 'center', justifyContent: 'center' }}>
        {on ? <Text style={{ color: colors.onPrimary, fontSize: 14, lineHeight: 16 }}>✓</Text> : null}
      </View>
    </Pressable>
  );
}

export default function HistoryScreen() {
  const router = useRouter();
  const { can } = useCurrentScheme();
  const { data: funds } = useFunds();
  const { data: sets } = useAssumptionSets();
  const suggest = useHistorySuggestion();
  const adopt = useAdoptSuggestion();
  const [chosen, setChosen] = useState<string[] | null>(null);
  const [withCorrelations, setWithCorrelations] = useState(true);
  const s = suggest.data;
  const selected = chosen ?? s?.funds.map((f) => f.fundId) ?? [];
  const draft = sets?.find((x) => x.status === 'draft');
  const approved = sets?.find((x) => x.status === 'approved');
  const current = (fid: string) => s?.current?.funds.find((f) => f.fundId === fid);
  const colourIndex = (fid: string) => Math.max(0, funds?.funds.findIndex((f) => f.id === fid) ?? 0);

  if (!can('assumptions:edit')) return <Screen title="From price history"><Notice>Only the scheme actuary can derive assumptions from a price history.</Notice></Screen>;

  return (
    <Screen title="From price history" subtitle="Upload month-end total-return index levels; Keelson suggests returns, volatilities and correlations. Nothing is stored until you adopt them into a draft.">
      <Card title="Price history file">
        <Text style={styles.body}>
          A CSV with a <Text style={{ fontFamily: type.label.fontFamily }}>date</Text> column (YYYY-MM-DD, one row per month-end, oldest first) and one column per fund, headed with the fund&apos;s name exactly as on the Funds page.
        </Text>
        <FileUpload
          label="Choose a CSV file"
          testID="choose-history"
          busy={suggest.isPending}
          onFile={(f) => {
            setChosen(null);
            adopt.reset();
            suggest.mutate(f);
          }}
          hint="Up to 5 MB. Every bad line is listed; nothing is computed from a file with problems."
        />
        <UploadProblems error={suggest.error} />
      </Card>
      {s ? (
        <>
          <Card title="Suggested assumptions">
            <Text style={styles.body} testID="history-period">
              {date(s.from)} to {date(s.to)} · {s.months} monthly returns · {s.fileName}
            </Text>
            {s.thin ? <Notice tone="warning">{`Only ${s.months} months: short histories give unsteady estimates (fewer than 36 months is thin by common practice).`}</Notice> : null}
            {s.undefinedCorrelations.length ? <Notice tone="warning">{`Some funds never moved, so their correlations are undefined and shown as 0: ${s.funds.filter((f) => s.undefinedCorrelations.includes(f.fundId)).map((f) => f.name).join(', ')}.`}</Notice> : null}
            <DataTable
              label="Suggested and current assumptions"
              testID="suggestions"
              rows={s.funds}
              rowKey={(f) => f.fundId}
              columns={[
                { key: 'name', title: 'Fund', width: 150, render: (f) => f.name },
                { key: 'adopt', title: 'Adopt', width: 70, render: (f) => <Check on={selected.includes(f.fundId)} label={`Adopt ${f.name}`} onPress={() => setChosen(selected.includes(f.fundId) ? selected.filter((x) => x !== f.fundId) : [...selected, f.fundId])} /> },
                { key: 'r', title: 'Return (suggested)', align: 'right', width: 130, render: (f) => percent(f.annualReturn, 'rate') },
                { key: 'rc', title: `Return (v${s.current?.version ?? '–'})`, align: 'right', width: 110, render: (f) => percent(current(f.fundId)?.expectedReturn, 'rate') },
                { key: 'v', title: 'Volatility (suggested)', align: 'right', width: 140, render: (f) => percent(f.annualVolatility, 'rate') },
                { key: 'vc', title: `Volatility (v${s.current?.version ?? '–'})`, align: 'right', width: 120, render: (f) => percent(current(f.fundId)?.volatility, 'rate') },
                { key: 'm', title: 'Monthly mean', align: 'right', width: 110, render: (f) => percent(f.monthlyMean, 'rate') },
                { key: 'sd', title: 'Monthly sd', align: 'right', width: 100, render: (f) => percent(f.monthlySd, 'rate') },
              ]}
            />
            <Text style={styles.muted}>{s.method}</Text>
          </Card>
          <Card title="Growth of one unit">
            <GrowthChart dates={s.dates} series={s.funds.map((f) => ({ id: f.fundId, name: f.name, colourIndex: colourIndex(f.fundId), values: f.growth }))} />
          </Card>
          <Card title="Suggested correlations">
            <CorrelationEditor names={s.funds.map((f) => f.name)} matrix={s.correlations} />
          </Card>
          <Card title="Adopt into a draft">
            <View style={{ flexDirection: 'row', alignItems: 'center' }}>
              <Check on={withCorrelations} label="Adopt the correlations between the chosen funds" onPress={() => setWithCorrelations(!withCorrelations)} />
              <Text style={[styles.body, { flex: 1 }]}>Also adopt the correlations between the chosen funds</Text>
            </View>
            <Text style={styles.body}>
              {draft ? `The chosen figures go into draft v${draft.version}.` : approved ? `A new draft is started from v${approved.version} and the chosen figures go into it.` : 'There is no version to start a draft from yet.'}{' '}
              Charges and the economy stay as they are; review them before approval.
            </Text>
            {adopt.error ? <Notice tone="error">{adopt.error.message}</Notice> : null}
            {adopt.data ? (
              <Notice tone="success">
                <Text style={styles.body}>Adopted into draft v{adopt.data.version}.</Text>
              </Notice>
            ) : null}
            <View style={styles.row}>
              <Button
                label={`Adopt ${selected.length} fund${selected.length === 1 ? '' : 's'} into ${draft ? `draft v${draft.version}` : 'a new draft'}`}
                disabled={selected.length === 0 || (!draft && !approved)}
                busy={adopt.isPending}
                testID="adopt"
                onPress={() => adopt.mutate({ draftId: draft?.id, fromId: approved?.id, suggestion: s, fundIds: selected, correlations: withCorrelations })}
              />
              {adopt.data ? <Button label={`Open draft v${adopt.data.version}`} kind="secondary" onPress={() => router.push(`/assumptions/${adopt.data!.id}`)} testID="open-draft" /> : null}
            </View>
          </Card>
        </>
      ) : null}
    </Screen>
  );
}
