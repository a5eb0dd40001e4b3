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

/**
 * The words of a command line, each with its flag parts and a `takeValue()`
 * that returns the flag's value — inline ("--reps=500") or the next word,
 * which it then consumes — or undefined when there is none (the next word is
 * missing or starts with `valueStop`). Shared by the commands' parsers.
 * @example for (const { flag, takeValue } of eachArgument(['--reps', '500'])) flag === '--reps' && takeValue() // '500'
 */
export function* eachArgument(
  args: readonly string[],
  valueStop = '--',
): Generator<{ word: string; flag: string; inline: string | undefined; takeValue: () => string | undefined }> {
  for (let i = 0; i < args.length; i++) {
    const word = args[i]!;
    const { flag, inline } = flagParts(word);
    const takeValue = (): string | undefined => {
      if (inline !== undefined) return inline;
      const next = args[i + 1];
      if (next === undefined || next.startsWith(valueStop)) return undefined;
      i++;
      return next;
    };
    yield { word, flag, inline, takeValue };
  }
}
