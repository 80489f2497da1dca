import { useState } from 'react';
import { Pressable, StyleSheet } from 'react-native';
import { Text } from '@/components/ui';
import { colors, fonts, radius, space } from '@/components/ui/theme';

/** The first 8 hex digits, as people read a fingerprint out to each other ("3f9a c2d1"). */
export function shortHash(hash: string): string {
  return `${hash.slice(0, 4)} ${hash.slice(4, 8)}`;
}

function grouped(hash: string): string {
  return hash.replace(/(.{4})/g, '$1 ').trim();
}

/**
 * The SHA-256 of the terms both parties sign, short; tap for all 64 digits. Two copies of a contract with
 * the same fingerprint have the same terms, word for word.
 */
export function TermsFingerprint({ hash, version }: { hash: string; version?: number }) {
  const [full, setFull] = useState(false);
  return (
    <Pressable
      role="button"
      aria-expanded={full}
      aria-label={full ? 'Terms fingerprint, full' : 'Show the full terms fingerprint'}
      onPress={() => setFull((f) => !f)}
      style={styles.box}
      testID="terms-fingerprint"
    >
      <Text variant="caption" tone="muted">
        Terms{version ? ` version ${version}` : ''} · fingerprint (SHA-256) {full ? '' : '· tap for all of it'}
      </Text>
      <Text variant="label" style={styles.hash} selectable>
        {full ? grouped(hash) : `${shortHash(hash)} …`}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  box: { gap: 2, padding: space.md, borderRadius: radius.md, backgroundColor: colors.paper, borderWidth: 1, borderColor: colors.line },
  hash: { fontFamily: fonts.mono, letterSpacing: 0.5 },
});
