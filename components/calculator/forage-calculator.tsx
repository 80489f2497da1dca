import { useEffect, useMemo } from 'react';
import { StyleSheet, View } from 'react-native';
import { Formik, useFormikContext } from 'formik';
import { computeCalculator, type CalculatorValues } from '@/lib/grazing/calculator';
import { GENERAL_GRAZING_CAUTIONS } from '@/lib/grazing/general-cautions';
import { Card, Text, TwoPane } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { CautionList } from '@/components/safety/caution-list';
import { ForageInputs } from './forage-inputs';
import { BlockInputs, FlockInputs } from './herd-inputs';
import { CalculatorResults, CalculatorSummary } from './calculator-results';
import { useLayout } from '@/hooks/use-layout';
import { nestErrors } from '@/components/form/nest-errors';

// An invented example so the figures show at once; every field is the user's to change.
export const EXAMPLE_VALUES: CalculatorValues = {
  method: 'samples',
  frameAreaM2: 0.25,
  weighing: 'fresh',
  samples: [
    { freshGrams: 310, dryMatterPct: 20, dryGrams: null },
    { freshGrams: 260, dryMatterPct: 20, dryGrams: null },
    { freshGrams: 345, dryMatterPct: 20, dryGrams: null },
  ],
  heightIn: 8,
  residualIn: 3,
  lbDmPerAcrePerInch: 275,
  lbDmPerAcre: 2000,
  acres: 40,
  utilizationPct: 45,
  headCount: 500,
  bodyWeightLb: 150,
  intakePctBodyWeight: 2.5,
};

function Body() {
  const { values, setErrors } = useFormikContext<CalculatorValues>();
  const result = useMemo(() => computeCalculator(values), [values]);
  // The shared schemas' messages go beside the inputs as the user types.
  const errorKey = JSON.stringify(result.errors);
  const { isWide } = useLayout();
  useEffect(() => setErrors(nestErrors(result.errors) as never), [errorKey]); // eslint-disable-line react-hooks/exhaustive-deps
  return (
    <TwoPane
      main={
        <>
          {isWide ? null : <CalculatorSummary result={result} headCount={values.headCount} />}
          <Card style={styles.section}>
            <Text variant="heading">1 · Forage on the ground</Text>
            <ForageInputs />
          </Card>
          <Card style={styles.section}>
            <Text variant="heading">2 · The block</Text>
            <BlockInputs />
          </Card>
          <Card style={styles.section}>
            <Text variant="heading">3 · The flock</Text>
            <FlockInputs />
          </Card>
        </>
      }
      side={
        <>
          <CalculatorResults result={result} headCount={values.headCount} utilizationPct={values.utilizationPct} />
          <CautionList cautions={GENERAL_GRAZING_CAUTIONS} />
        </>
      }
    />
  );
}

export function ForageCalculator() {
  return (
    <Formik<CalculatorValues> initialValues={EXAMPLE_VALUES} onSubmit={() => {}} validateOnChange={false} validateOnBlur={false}>
      <View style={{ gap: space.md }}>
        <Text variant="caption" tone="muted">
          The figures below start from an invented example — replace them with your own.
        </Text>
        <Body />
      </View>
    </Formik>
  );
}

const styles = StyleSheet.create({ section: { gap: space.md } });
