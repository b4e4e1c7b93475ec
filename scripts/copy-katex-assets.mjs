// Metro cannot bundle the font files KaTeX's stylesheet refers to, so the stylesheet and its fonts
// are copied into public/ where Expo's web export ships them verbatim.
import { cpSync, mkdirSync, existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);
let katexDist;
try {
  katexDist = join(dirname(require.resolve('katex/package.json')), 'dist');
} catch {
  process.exit(0); // katex not installed yet (e.g. a partial install); nothing to copy
}
const target = join(process.cwd(), 'public', 'katex');
mkdirSync(target, { recursive: true });
cpSync(join(katexDist, 'katex.min.css'), join(target, 'katex.min.css'));
if (existsSync(join(katexDist, 'fonts'))) cpSync(join(katexDist, 'fonts'), join(target, 'fonts'), { recursive: true });
