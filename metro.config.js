// Expo's Metro defaults, plus WOFF2 as an asset type: the web build bundles subset WOFF2 fonts
// (hooks/use-app-fonts.web.ts), which Metro does not know out of the box.
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
config.resolver.assetExts.push('woff2');

module.exports = config;
