import { useMemo, useState } from 'react';
import { View } from 'react-native';
import { WebView } from 'react-native-webview';
import { KATEX_STYLESHEET_PATH, renderTex, renderWrappingDisplay, type FormulaProps } from './renderTex';

const SERVER_URL = process.env.EXPO_PUBLIC_API_URL ?? '';

/** Native: KaTeX markup inside a small web view that reports its height back to size itself. */
export function Formula({ tex, display = false, label, testID }: FormulaProps) {
  const [height, setHeight] = useState(display ? 56 : 28);
  const html = useMemo(
    () => `<!doctype html><html><head><meta name="viewport" content="width=device-width,initial-scale=1">
<link rel="stylesheet" href="${SERVER_URL}${KATEX_STYLESHEET_PATH}">
<style>body{margin:0;background:transparent;font-size:18px}</style></head>
<body>${display ? renderWrappingDisplay(tex) : renderTex(tex, false)}<script>
new ResizeObserver(()=>window.ReactNativeWebView.postMessage(String(document.body.scrollHeight))).observe(document.body);
</script></body></html>`,
    [tex, display],
  );
  return (
    <View accessible accessibilityLabel={label ?? tex} style={{ height }} testID={testID}>
      <WebView
        originWhitelist={['*']}
        source={{ html, baseUrl: SERVER_URL || undefined }}
        scrollEnabled={false}
        style={{ backgroundColor: 'transparent' }}
        onMessage={(event) => setHeight(Math.max(20, Number(event.nativeEvent.data) || height))}
      />
    </View>
  );
}
