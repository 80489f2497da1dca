import { View } from 'react-native';
import type { Caution } from '@/lib/grazing/general-cautions';
import { Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';

/** Cautions that protect people, animals and crops; always closes by deferring to the label and licensed advice. */
export function CautionList({ cautions, title = 'Before animals go in' }: { cautions: readonly Caution[]; title?: string }) {
  return (
    <View style={{ gap: space.sm }} aria-label={title}>
      <Text variant="heading">{title}</Text>
      {cautions.map((c) => (
        <Notice key={c.key} tone={c.tone} title={c.title}>
          {c.text}
        </Notice>
      ))}
      <Text variant="caption" tone="muted">
        Fieldfold's figures and notes are planning aids, not advice. The pesticide label, local rules, your certifier and licensed advisers
        (agronomist, pest control adviser, veterinarian) come first.
      </Text>
    </View>
  );
}
