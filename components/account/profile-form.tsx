import { useState } from 'react';
import { View } from 'react-native';
import { Formik } from 'formik';
import { profileSchema, type AccountView, type ProfileInput } from '@/lib/schemas/account';
import { useUpdateProfile } from '@/hooks/api/account';
import { Button, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { FlockFields } from './flock-fields';

type Values = Required<Pick<ProfileInput, 'name'>> & Omit<ProfileInput, 'activeRole' | 'name'>;

function initialValues(user: AccountView): Values {
  return {
    name: user.name,
    businessName: user.businessName ?? '',
    phone: user.phone ?? '',
    homePlace: user.homePlace ?? '',
    homeLatitude: user.homeLatitude,
    homeLongitude: user.homeLongitude,
    flock: user.flock ?? (user.roles.includes('grazier') ? { species: 'sheep', animalClass: 'dry ewes', headCount: null as never, bodyWeightLb: null as never } : null),
  };
}

export function ProfileForm({ user }: { user: AccountView }) {
  const update = useUpdateProfile();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const isGrazier = user.roles.includes('grazier');
  return (
    <Formik<Values>
      initialValues={initialValues(user)}
      validationSchema={profileSchema}
      enableReinitialize
      onSubmit={async (values, helpers) => {
        setFormError(null);
        setSaved(false);
        const flockBlank = values.flock && values.flock.headCount == null && values.flock.bodyWeightLb == null;
        try {
          await update.mutateAsync({ ...values, flock: isGrazier && !flockBlank ? values.flock : undefined });
          setSaved(true);
        } catch (err) {
          setFormError(applyServerErrors(err, helpers));
        }
      }}
    >
      {({ handleSubmit, isSubmitting, dirty }) => (
        <View style={{ gap: space.lg }}>
          <FormError message={formError} />
          {saved && !dirty ? <Notice tone="ok">Profile saved.</Notice> : null}
          <FormTextField name="name" label="Your name" autoComplete="name" />
          <FormTextField name="businessName" label="Business name" hint="Shown to the other side of a contract and on invoices." />
          <FormTextField name="phone" label="Phone" inputMode="tel" autoComplete="tel" />
          <Text variant="heading">Home base</Text>
          <Text variant="caption" tone="muted">
            Where your yard or farm office is. Distances to blocks are measured from here, as the crow flies.
          </Text>
          <FormTextField name="homePlace" label="Place name" />
          <View style={{ flexDirection: 'row', gap: space.md }}>
            <View style={{ flex: 1 }}>
              <FormTextField name="homeLatitude" label="Latitude" numeric unit="°N" />
            </View>
            <View style={{ flex: 1 }}>
              <FormTextField name="homeLongitude" label="Longitude" numeric unit="°E" hint="West is negative" />
            </View>
          </View>
          {isGrazier ? <FlockFields /> : null}
          <Button title="Save profile" onPress={() => handleSubmit()} loading={isSubmitting} />
        </View>
      )}
    </Formik>
  );
}
