// Which new passwords are refused: too short, blank-padded, one repeated character, or one of
// the commonest choices (a word from the top of breached-password lists with digits or symbols
// around it). A small list on purpose: length does most of the work (NIST SP 800-63B §5.1.1.2
// asks for a check against commonly used values, and no composition rules).

export const PASSWORD_MIN_LENGTH = 12;

/** Words that head every list of breached passwords (from memory of the published top lists). */
const COMMON_WORDS = new Set([
  'password',
  'passw0rd',
  'p@ssw0rd',
  'p@ssword',
  'qwerty',
  'qwertyuiop',
  'asdfgh',
  'asdfghjkl',
  'zxcvbnm',
  'azerty',
  'letmein',
  'welcome',
  'iloveyou',
  'admin',
  'administrator',
  'abc',
  'abcdef',
  'abcdefghijkl',
  'monkey',
  'dragon',
  'football',
  'baseball',
  'soccer',
  'sunshine',
  'princess',
  'superman',
  'batman',
  'changeme',
  'trustno',
  'master',
  'shadow',
  'starwars',
  'whatever',
  'freedom',
  'secret',
  'login',
  'hello',
  'charlie',
  'michael',
  'jennifer',
  'qazwsx',
  'qwer',
  'asdf',
  'zaq',
  'test',
  'guest',
  'default',
  'summer',
  'winter',
  'spring',
  'autumn',
  'access',
]);

/** Keyboard and digit runs that are common whole passwords. */
const COMMON_WHOLE = new Set([
  '123456789012',
  '1234567890123',
  '12345678901234',
  '123123123123',
  '111111111111',
  '000000000000',
  '1q2w3e4r5t6y',
  '1qaz2wsx3edc',
  'zaq12wsxcde3',
  'qazwsxedcrfv',
  '123qweasdzxc',
  '1234qwerasdf',
  'qwer1234asdf',
  'q1w2e3r4t5y6',
  'qwertyuiopasdfghjkl',
  'abcdefghijklmnop',
  'abcd1234abcd',
  'aaaa1111bbbb',
]);

/** Why a new password is refused, or null when it is fine. */
export function passwordProblem(password: string): string | null {
  if (password.trim().length < PASSWORD_MIN_LENGTH) return `At least ${PASSWORD_MIN_LENGTH} characters, not counting spaces at either end`;
  const lower = password.toLowerCase();
  if (new Set(lower).size <= 2) return 'Use more than one or two different characters';
  if (COMMON_WHOLE.has(lower)) return 'This is one of the most common passwords; choose another';
  // "Password2025!", "!!welcome1234", "Summer-2025-Summer": common words padded with digits and symbols.
  const words = lower.split(/[^a-z@]+/).filter(Boolean);
  if (words.length > 0 && words.every((w) => COMMON_WORDS.has(w))) return 'This is one of the most common passwords; choose another';
  return null;
}
