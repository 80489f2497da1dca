import { useEffect, useMemo, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Button, Card, Screen, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { useSession } from '@/hooks/auth/session';
import { useLayout } from '@/hooks/use-layout';
import { formatNumber } from '@/lib/format';
import { MarketFilterBar, SortChoice } from '@/components/market/market-filter-bar';
import { MarketResults } from '@/components/market/market-results';
import { activeFilterCount, emptyMarketFilters, marketQuery, type MarketFilterValues } from '@/components/market/market-query';
import { CalculatorCard } from './calculator-card';
import { ProfileNudge } from './profile-nudge';

/** Typed filters wait this long after the last keystroke before the list is asked again. */
const TYPING_PAUSE_MS = 350;

/** Find grazing: the open blocks, filtered for my dates, distance, size and flock; filters beside the list on a wide screen. */
export function GrazierHome() {
  const { user } = useSession();
  const { isWide } = useLayout();
  const hasHome = user?.homeLatitude != null && user?.homeLongitude != null;
  const flock = user?.flock ?? null;

  const [values, setValues] = useState<MarketFilterValues>(() => emptyMarketFilters(hasHome));
  const [applied, setApplied] = useState<MarketFilterValues>(values);
  const [filtersOpen, setFiltersOpen] = useState(false);

  useEffect(() => {
    const t = setTimeout(() => setApplied(values), TYPING_PAUSE_MS);
    return () => clearTimeout(t);
  }, [values]);

  const change = (next: MarketFilterValues) => {
    setValues(next);
    // Choices (species, sort) apply at once; only typing waits for a pause.
    if (next.species !== values.species || next.sort !== values.sort) setApplied(next);
  };
  const clear = () => {
    const empty = { ...emptyMarketFilters(hasHome), sort: values.sort };
    setValues(empty);
    setApplied(empty);
  };

  const typed = useMemo(() => marketQuery(values), [values]);
  const query = useMemo(() => marketQuery(applied), [applied]);
  const count = activeFilterCount(values);

  const filterBar = (
    <MarketFilterBar
      values={values}
      errors={typed.errors}
      onChange={change}
      onClear={clear}
      hasHome={hasHome}
      flockHead={flock?.headCount ?? null}
      showSort={isWide}
    />
  );
  const results = <MarketResults filters={query.filters} filtering={activeFilterCount(applied) > 0} onClear={clear} wide={isWide} />;
  const flockLine = flock
    ? `${formatNumber(flock.headCount)} ${flock.animalClass} (${flock.species}), about ${formatNumber(flock.bodyWeightLb)} lb`
    : null;

  return (
    <Screen title="Find grazing" subtitle={user?.businessName ?? user?.name}>
      <ProfileNudge role="grazier" />
      {isWide ? (
        <View style={styles.wide}>
          <View style={styles.side}>
            {flockLine ? (
              <Card>
                <Text variant="label" tone="muted">
                  Figures are for your flock
                </Text>
                <Text variant="bodyStrong">{flockLine}</Text>
                {user?.homePlace ? (
                  <Text variant="caption" tone="muted">
                    Distances from {user.homePlace}
                  </Text>
                ) : null}
              </Card>
            ) : null}
            <Card>
              <Text variant="heading">Filters</Text>
              {filterBar}
            </Card>
            <CalculatorCard />
          </View>
          <View style={styles.main}>{results}</View>
        </View>
      ) : (
        <View style={styles.col}>
          {flockLine ? (
            <Text variant="caption" tone="muted">
              Days of feed are for your {flockLine}.
            </Text>
          ) : null}
          <View style={styles.toolbar}>
            <Button
              title={filtersOpen ? 'Hide filters' : count > 0 ? `Filters (${count})` : 'Filters'}
              variant="secondary"
              compact
              aria-expanded={filtersOpen}
              onPress={() => setFiltersOpen((o) => !o)}
            />
          </View>
          {filtersOpen ? (
            <Card>
              {filterBar}
              <Button title="Show the blocks" onPress={() => setFiltersOpen(false)} />
            </Card>
          ) : null}
          <SortChoice value={values.sort} onChange={(sort) => change({ ...values, sort })} hasHome={hasHome} hasFlock={!!flock} error={typed.errors.sort} />
          {results}
          <CalculatorCard />
        </View>
      )}
    </Screen>
  );
}

const styles = StyleSheet.create({
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  side: { width: 320, gap: space.md },
  main: { flex: 1, minWidth: 0, gap: space.md },
  col: { gap: space.md },
  toolbar: { flexDirection: 'row', gap: space.sm, alignItems: 'center' },
});
