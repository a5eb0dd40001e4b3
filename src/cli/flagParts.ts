/**
 * A command-line word split into its flag and an inline value: "--reps=500"
 * gives { flag: "--reps", inline: "500" }; "--reps" or "plan.json" give the
 * word itself and no inline value. Shared by every command's parser.
 * @example flagParts('--format=docx') // { flag: '--format', inline: 'docx' }
 */
export function flagParts(word: string): { flag: string; inline: string | undefined } {
  const eq = word.indexOf('=');
  return word.startsWith('--') && eq > 0 ? { flag: word.slice(0, eq), inline: word.slice(eq + 1) } : { flag: word, inline: undefined };
}
