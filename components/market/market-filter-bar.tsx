import { StyleSheet, View } from 'react-native';
import { Button, Chip, Text, TextField } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { formatNumber } from '@/lib/format';
import { GRAZING_SPECIES } from '@/lib/schemas/block';
import { SORT_OPTIONS, activeFilterCount, type MarketFilterValues, type MarketQuery, type MarketSort, type MarketTextFilter } from './market-query';

export interface MarketFilterBarProps {
  values: MarketFilterValues;
  errors: MarketQuery['errors'];
  onChange: (next: MarketFilterValues) => void;
  onClear: () => void;
  /** The grazier's home base is set (distance filter and sort need it). */
  hasHome: boolean;
  /** Head in the grazier's flock profile, or null without one (days-of-feed filter and sort need it). */
  flockHead: number | null;
  /** The sort choice sits inside the filters (wide) or stays in view above the results (phone). */
  showSort?: boolean;
}

/** What narrows the open blocks: my dates, distance, size, days of feed, species; and the order. */
export function MarketFilterBar({ values, errors, onChange, onClear, hasHome, flockHead, showSort = true }: MarketFilterBarProps) {
  const set = (key: MarketTextFilter) => (text: string) => onChange({ ...values, [key]: text });
  const count = activeFilterCount(values);
  return (
    <View style={styles.col} aria-label="Filters">
      <View style={styles.group}>
        <Text variant="label">My dates</Text>
        <View style={styles.row}>
          <View style={styles.cell}>
            <TextField label="Free from" value={values.from} onChangeText={set('from')} placeholder="YYYY-MM-DD" error={errors.from} autoCapitalize="none" />
          </View>
          <View style={styles.cell}>
            <TextField label="Free until" value={values.to} onChangeText={set('to')} placeholder="YYYY-MM-DD" error={errors.to} autoCapitalize="none" />
          </View>
        </View>
        <Text variant="caption" tone="muted">
          Blocks with at least one grazeable day in these dates.
        </Text>
      </View>

      {hasHome ? (
        <TextField
          label="Within"
          unit="miles"
          value={values.maxMiles}
          onChangeText={set('maxMiles')}
          inputMode="decimal"
          error={errors.maxMiles}
          hint="As the crow flies from your home base."
        />
      ) : (
        <Unavailable label="Distance" text="Add your home base in Account to filter and sort by distance." />
      )}

      <View style={styles.group}>
        <View style={styles.row}>
          <View style={styles.cell}>
            <TextField label="Acres from" unit="ac" value={values.minAcres} onChangeText={set('minAcres')} inputMode="decimal" error={errors.minAcres} />
          </View>
          <View style={styles.cell}>
            <TextField label="Acres up to" unit="ac" value={values.maxAcres} onChangeText={set('maxAcres')} inputMode="decimal" error={errors.maxAcres} />
          </View>
        </View>
      </View>

      {flockHead != null ? (
        <TextField
          label="Feeds my flock at least"
          unit="days"
          value={values.minDays}
          onChangeText={set('minDays')}
          inputMode="decimal"
          error={errors.minDays}
          hint={`Days for your ${formatNumber(flockHead)} head at each grower's target take.`}
        />
      ) : (
        <Unavailable label="Days of feed" text="Describe your flock in Account to filter and sort by the days each block feeds it." />
      )}

      <View style={styles.group} role="radiogroup" aria-label="Species allowed">
        <Text variant="label">Species allowed</Text>
        <View style={styles.chips}>
          <Chip label="Any" on={values.species === ''} onPress={() => onChange({ ...values, species: '' })} />
          {GRAZING_SPECIES.map((s) => (
            <Chip key={s} label={s} on={values.species === s} onPress={() => onChange({ ...values, species: s })} />
          ))}
        </View>
      </View>

      {showSort ? (
        <SortChoice value={values.sort} onChange={(sort) => onChange({ ...values, sort })} hasHome={hasHome} hasFlock={flockHead != null} error={errors.sort} />
      ) : null}

      {count > 0 ? <Button title={`Clear ${count === 1 ? 'the filter' : `${count} filters`}`} variant="quiet" compact onPress={onClear} /> : null}
    </View>
  );
}

/** A filter the profile cannot support yet, said plainly instead of an input that does nothing. */
function Unavailable({ label, text }: { label: string; text: string }) {
  return (
    <View style={styles.group}>
      <Text variant="label">{label}</Text>
      <Text variant="caption" tone="muted">
        {text}
      </Text>
    </View>
  );
}

export function SortChoice({
  value,
  onChange,
  hasHome,
  hasFlock,
  error,
}: {
  value: MarketSort;
  onChange: (sort: MarketSort) => void;
  hasHome: boolean;
  hasFlock: boolean;
  error?: string;
}) {
  const options = SORT_OPTIONS.filter((o) => (o.needs === 'home' ? hasHome : o.needs === 'flock' ? hasFlock : true));
  return (
    <View style={styles.group} role="radiogroup" aria-label="Sort by">
      <Text variant="label">Sort by</Text>
      <View style={styles.chips}>
        {options.map((o) => (
          <Chip key={o.value} label={o.label} on={value === o.value} onPress={() => onChange(o.value)} />
        ))}
      </View>
      {error ? (
        <Text variant="caption" tone="danger">
          {error}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.lg },
  group: { gap: space.xs },
  row: { flexDirection: 'row', gap: space.sm },
  cell: { flex: 1, minWidth: 0 },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
