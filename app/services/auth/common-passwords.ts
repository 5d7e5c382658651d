/**
 * Passwords that people pick most often, refused at sign-up, reset and password change
 * (NIST SP 800-63B rev. 3 §5.1.1.2: compare new passwords against a list of commonly used or
 * compromised values).
 *
 * We ship no downloaded breach list. Instead this small deterministic generator composes the
 * patterns that dominate such lists — everyday words and short words followed by digits, years or
 * "!", keyboard walks, counting sequences, repeated characters and dates — into a few thousand
 * entries. It is our own approximation of "the commonest few thousand"; the same code always
 * produces the same list, and the unit test pins its size.
 */

const WORDS = [
  // Words that head every published frequency list of leaked passwords.
  "password",
  "passwort",
  "secret",
  "letmein",
  "welcome",
  "iloveyou",
  "trustno1",
  "changeme",
  "default",
  "admin",
  "administrator",
  "login",
  "master",
  "access",
  "guest",
  "test",
  "testing",
  "user",
  "root",
  "system",
  "whatever",
  "freedom",
  "sunshine",
  "princess",
  "dragon",
  "monkey",
  "shadow",
  "football",
  "baseball",
  "soccer",
  "hockey",
  "basketball",
  "summer",
  "winter",
  "spring",
  "autumn",
  "flower",
  "cookie",
  "chocolate",
  "butterfly",
  "computer",
  "internet",
  "hello",
  "love",
  "lovely",
  "angel",
  "baby",
  "family",
  "friends",
  "forever",
  "happy",
  "lucky",
  "money",
  "orange",
  "banana",
  "cheese",
  "pepper",
  "ginger",
  "tiger",
  "eagle",
  "falcon",
  "killer",
  "hunter",
  "ranger",
  "matrix",
  "silver",
  "golden",
  "diamond",
  "purple",
  "yellow",
  "qwerty",
  "abc",
  "abcd",
  "pass",
  "temp",
  "server",
  "office",
  "school",
  "account",
  "heaven",
  "superstar",
  "starlight",
  "mountain",
  "ocean",
  "thunder",
  "phoenix",
  "dolphin",
  "rainbow",
  // Words this audience reaches for, and the product's own name (context-specific, per the same section).
  "garage",
  "engine",
  "turbo",
  "diesel",
  "wrench",
  "torque",
  "mechanic",
  "offroad",
  "truck",
  "pickup",
  "racing",
  "motor",
  "overland",
  "horsepower",
  "torqueleaf",
];

const SUFFIXES = ["", "1", "12", "123", "1234", "12345", "123456", "!", "1!", "123!", "01", "007", "99", "00", "11", "2000"];

const KEYBOARD_WALKS = [
  "qwerty",
  "qwertyu",
  "qwertyui",
  "qwertyuiop",
  "asdfgh",
  "asdfghjk",
  "asdfghjkl",
  "zxcvbn",
  "zxcvbnm",
  "qazwsx",
  "qazwsxedc",
  "1qaz2wsx",
  "1qaz2wsx3edc",
  "1q2w3e4r",
  "1q2w3e4r5t",
  "1q2w3e4r5t6y",
  "q1w2e3r4",
  "q1w2e3r4t5",
  "zaq12wsx",
  "zaq1zaq1",
  "!qaz2wsx",
  "qweasdzxc",
  "1qazxsw2",
  "poiuytrewq",
  "mnbvcxz",
  "qwer1234",
  "asdf1234",
  "zxcv1234",
  "1234qwer",
  "1234asdf",
  "qweasd123",
  "qwe123qwe",
  "qwertz123",
  "azerty123",
  "ytrewq123",
  "qwerty123",
  "qwerty1234",
  "qwertyuiop123",
  "asdfasdf",
  "qwerqwer",
  "zxczxczx",
];

const COUNTING = "12345678901234567890";
const REVERSED = "09876543210987654321";

function* generate(): Generator<string> {
  for (const word of WORDS) {
    for (const suffix of SUFFIXES) yield word + suffix;
    for (let year = 1960; year <= 2030; year++) yield `${word}${year}`;
    yield word + word;
  }
  for (const walk of KEYBOARD_WALKS) {
    yield walk;
    yield `${walk}!`;
    yield `${walk}1`;
  }
  for (let length = 8; length <= 16; length++) {
    yield COUNTING.slice(0, length);
    yield COUNTING.slice(1, length + 1);
    yield REVERSED.slice(1, length + 1);
    yield REVERSED.slice(2, length + 2);
    for (let digit = 0; digit <= 9; digit++) yield String(digit).repeat(length);
    for (let code = 97; code <= 122; code++) yield String.fromCharCode(code).repeat(length);
    yield "abcdefghijklmnopqrstuvwxyz".slice(0, length);
  }
  for (const unit of ["12", "123", "1234", "abc", "abcd", "ab", "01", "qwe", "asd"]) {
    for (let length = 8; length <= 12; length++) yield unit.repeat(Math.ceil(length / unit.length)).slice(0, length);
  }
  for (const prefix of ["abc", "abcd", "a1b2c3", "aa", "xx", "pass", "qwe"]) {
    for (const digits of ["12345", "1234", "123456", "123", "11111", "00000"]) yield prefix + digits;
  }
  // Dates typed as digits: the first of each month and a few memorable days, for birth years.
  for (let year = 1950; year <= 2020; year++) {
    for (const [day, month] of [
      ["01", "01"],
      ["25", "12"],
      ["31", "12"],
      ["14", "02"],
      ["11", "11"],
    ]) {
      yield `${day}${month}${year}`;
      yield `${month}${day}${year}`;
    }
  }
}

/** Lower-cased, with the most common symbol-for-letter swaps undone, so "P@ssw0rd" meets "password". */
const UNSWAP: Record<string, string> = { "@": "a", "4": "a", "0": "o", "3": "e", $: "s", "5": "s", "7": "t" };

export function unswap(value: string): string {
  return value.replace(/[@40$357]/g, (c) => UNSWAP[c] ?? c);
}

export const COMMON_PASSWORDS: ReadonlySet<string> = new Set(
  [...generate()].map((p) => p.toLowerCase()).filter((p) => p.length >= 8),
);

export function isCommonPassword(password: string): boolean {
  const lower = password.normalize("NFKC").toLowerCase();
  return COMMON_PASSWORDS.has(lower) || COMMON_PASSWORDS.has(unswap(lower));
}
