import { StyleSheet, View, type StyleProp, type ViewStyle } from 'react-native';
import { Text } from './text';
import { colors, radius, space } from './theme';

export interface FigureProps {
  label: string;
  value: string;
  /** Unit or a short explanation under the value. */
  detail?: string;
  testID?: string;
  /** The figure the reader came for: larger type on the cover-crop wash. */
  strong?: boolean;
  style?: StyleProp<ViewStyle>;
}

/** One labelled figure in a grid of them (calculator results, block facts, a bid's estimate). */
export function Figure({ label, value, detail, testID, strong, style }: FigureProps) {
  return (
    <View style={[styles.figure, strong && styles.strong, style]}>
      <Text variant="caption" tone="muted">
        {label}
      </Text>
      <Text variant={strong ? 'figure' : 'bodyStrong'} testID={testID}>
        {value}
      </Text>
      {detail ? (
        <Text variant="caption" tone="muted">
          {detail}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  figure: { flexGrow: 1, flexBasis: 150, padding: space.md, borderRadius: radius.md, backgroundColor: colors.paper, gap: 2 },
  strong: { backgroundColor: colors.coverWash },
});
