import { View } from 'react-native';
import { FLOCK_CLASSES, FLOCK_SPECIES } from '@/lib/schemas/account';
import { Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { FormChips } from '@/components/form/form-choice';

export function FlockFields() {
  return (
    <View style={{ gap: space.md }}>
      <Text variant="heading">Your flock</Text>
      <FormChips name="flock.species" label="Species" options={FLOCK_SPECIES} />
      <FormChips name="flock.animalClass" label="Class" options={FLOCK_CLASSES} />
      <View style={{ flexDirection: 'row', gap: space.md }}>
        <View style={{ flex: 1 }}>
          <FormTextField name="flock.headCount" label="Head count" numeric unit="head" />
        </View>
        <View style={{ flex: 1 }}>
          <FormTextField name="flock.bodyWeightLb" label="Typical body weight" numeric unit="lb" />
        </View>
      </View>
    </View>
  );
}
