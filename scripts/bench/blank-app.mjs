// The yardstick for `npm run bench`: a blank two-screen Expo Router app (a home and a sign-in form, nothing else),
// written into a temp folder that links this project's node_modules, exported in single and static output, then
// compressed by the same build step and served by the same server as Fieldfold.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

const FILES = {
  'package.json': JSON.stringify({ name: 'bench-blank', private: true, main: 'expo-router/entry' }),
  'babel.config.js': "module.exports = function (api) { api.cache(true); return { presets: ['babel-preset-expo'] }; };\n",
  'app/_layout.tsx': `import { Stack } from 'expo-router';
export default function Layout() {
  return <Stack screenOptions={{ headerShown: false }} />;
}
`,
  'app/index.tsx': `import { Link } from 'expo-router';
import { Text, View } from 'react-native';
export default function Home() {
  return (
    <View style={{ flex: 1, padding: 24, gap: 12 }}>
      <Text style={{ fontSize: 24 }}>Home</Text>
      <Link href="/sign-in">Sign in</Link>
    </View>
  );
}
`,
  'app/sign-in.tsx': `import { useState } from 'react';
import { Pressable, Text, TextInput, View } from 'react-native';
export default function SignIn() {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [sent, setSent] = useState(false);
  return (
    <View style={{ flex: 1, padding: 24, gap: 12 }}>
      <Text style={{ fontSize: 24 }}>Sign in</Text>
      <TextInput aria-label="Email" value={email} onChangeText={setEmail} style={{ borderWidth: 1, padding: 8 }} />
      <TextInput aria-label="Password" value={password} onChangeText={setPassword} secureTextEntry style={{ borderWidth: 1, padding: 8 }} />
      <Pressable role="button" onPress={() => setSent(true)} style={{ padding: 12, backgroundColor: '#333' }}>
        <Text style={{ color: 'white' }}>{sent ? 'Signing in…' : 'Sign in'}</Text>
      </Pressable>
    </View>
  );
}
`,
};

/** Writes the blank app for `output` ('single' | 'static') and returns its folder. */
export function writeBlankApp(root, output) {
  const dir = path.join(os.tmpdir(), `fieldfold-bench-blank-${output}`);
  fs.rmSync(dir, { recursive: true, force: true });
  fs.mkdirSync(path.join(dir, 'app'), { recursive: true });
  for (const [file, text] of Object.entries(FILES)) fs.writeFileSync(path.join(dir, file), text);
  const appJson = { expo: { name: 'Blank', slug: 'bench-blank', platforms: ['web'], web: { bundler: 'metro', output }, plugins: ['expo-router'] } };
  fs.writeFileSync(path.join(dir, 'app.json'), JSON.stringify(appJson, null, 2));
  fs.symlinkSync(path.join(root, 'node_modules'), path.join(dir, 'node_modules'), 'dir');
  return dir;
}
