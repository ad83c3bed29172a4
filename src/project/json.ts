/**
 * Parse JSON text with errors that name the file, the line and the column, and the text found
 * there, instead of a bare "Unexpected token".
 */
import { InputError } from '../../engine/errors';
import { checkJsonDepth } from '../io/limits';

export function parseJson(text: string, file: string): unknown {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  if (!body.trim()) throw new InputError('empty-file', `${file}: the file is empty`, { file }, 'Expected a JSON document');
  checkJsonDepth(body, file);
  try {
    return JSON.parse(body);
  } catch (e) {
    const msg = (e as Error).message;
    const m = /position (\d+)/.exec(msg);
    let line = 1;
    let column = 1;
    let pos = m ? Number(m[1]) : -1;
    const lc = /line (\d+) column (\d+)/.exec(msg);
    if (lc) {
      line = Number(lc[1]);
      column = Number(lc[2]);
      pos = -1;
    } else if (pos >= 0) {
      for (let i = 0; i < pos && i < body.length; i++) {
        if (body[i] === '\n') {
          line++;
          column = 1;
        } else column++;
      }
    }
    const lineText = body.split(/\r?\n/)[line - 1] ?? '';
    const near = lineText.slice(Math.max(0, column - 20), column + 20).trim();
    throw new InputError('bad-json', `${file}: not valid JSON at line ${line}, column ${column} (near '${near}')`, { file, row: line, column, text: near }, 'Check for a missing comma, quote or bracket');
  }
}
