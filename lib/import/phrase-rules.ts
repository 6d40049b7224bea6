/**
 * A small word-phrase matcher for classifying free text by ordered rules, built for speed.
 *
 * The phrases' first words are compiled into a table-driven automaton over characters: one
 * pass over the text, one table step per character, finds where words start and end and which
 * phrases can start at each word. Only those phrases are then checked word by word. Nothing is
 * allocated per text. (Running one regular expression per rule cost several times more per
 * row, and so did splitting the text into word strings.)
 *
 * Phrase notation, words separated by single spaces:
 * - `stall*` a word starting with "stall"; `dies|died` either word; `but?` an optional word;
 * - a first token `!radio|fan` means the phrase must not follow one of those words; a last token
 *   `!to|windows` means it must not be followed by one of them.
 * Case does not matter; apostrophes inside words vanish ("won't" → "wont"); any character other
 * than a-z, A-Z and 0-9 separates words ("no-start" → "no start").
 */

/** Letter classes: a–z and A–Z 0–25, 0–9 26–35; SEPARATOR for every other character. */
const CLASSES = new Int8Array(128).fill(-1);
for (let c = 0; c < 26; c++) {
  CLASSES[97 + c] = c;
  CLASSES[65 + c] = c;
}
for (let c = 0; c < 10; c++) CLASSES[48 + c] = 26 + c;
const SEPARATOR = 36;
const CLASS_COUNT = 37;

/** The class of a character code (non-ASCII characters separate words). */
function classOf(c: number): number {
  const k = c < 128 ? (CLASSES[c] as number) : -1;
  return k < 0 ? SEPARATOR : k;
}

/** A letter tree of words: whole words end at `isWord` nodes, prefixes at `isPrefix` ones. */
type WordNode = {
  children: (WordNode | null)[];
  isWord: boolean;
  isPrefix: boolean;
};

const newWordNode = (): WordNode => ({
  children: new Array<WordNode | null>(SEPARATOR).fill(null),
  isWord: false,
  isPrefix: false,
});

/** The words one position of a phrase accepts. */
type WordTest = { root: WordNode; isOptional: boolean };

type Phrase = {
  rule: number;
  /** The words after the first. */
  rest: readonly WordTest[];
  notBefore: WordTest | null;
  notAfter: WordTest | null;
};

function parseWordTest(token: string): WordTest {
  const isOptional = token.endsWith("?");
  const body = isOptional ? token.slice(0, -1) : token;
  const root = newWordNode();
  for (const alt of body.split("|")) {
    if (!/^[a-z0-9]+\*?$/.test(alt)) throw new Error(`phrase-rules: bad word "${alt}"`);
    const isPrefix = alt.endsWith("*");
    const word = isPrefix ? alt.slice(0, -1) : alt;
    let node = root;
    for (let i = 0; i < word.length; i++) {
      node = node.children[classOf(word.charCodeAt(i))] ??= newWordNode();
    }
    if (isPrefix) node.isPrefix = true;
    else node.isWord = true;
  }
  return { root, isOptional };
}

/** Does the word s[a, b) pass the test? One step per letter, stopping at the first miss. */
function accepts(test: WordTest, s: string, a: number, b: number): boolean {
  let node: WordNode | null = test.root;
  for (let i = a; i < b; i++) {
    if (node.isPrefix) return true;
    node = node.children[classOf(s.charCodeAt(i))] as WordNode | null;
    if (node === null) return false;
  }
  return node.isWord || node.isPrefix;
}

function grown(a: Int32Array<ArrayBuffer>): Int32Array<ArrayBuffer> {
  const b = new Int32Array(a.length * 2);
  b.set(a);
  return b;
}

/**
 * The words of the text being classified, as start and end offsets, and the phrase lists met
 * at them. One instance serves every classifier (JavaScript runs one at a time), reused from
 * text to text.
 */
const scratch = {
  text: "",
  count: 0,
  starts: new Int32Array(64),
  ends: new Int32Array(64),
  pendingLists: [] as Phrase[][],
  pendingWords: new Int32Array(64),
  pendingCount: 0,

  /** Does word k pass the test? */
  passes(test: WordTest, k: number): boolean {
    return accepts(test, this.text, this.starts[k] as number, this.ends[k] as number);
  },

  pend(list: Phrase[], w: number): void {
    if (this.pendingCount === this.pendingWords.length) {
      this.pendingWords = grown(this.pendingWords);
    }
    this.pendingLists[this.pendingCount] = list;
    this.pendingWords[this.pendingCount++] = w;
  },
};

/** Index of the word after the match of rest[k..] from word w, or -1. */
function matchRest(rest: readonly WordTest[], k: number, w: number): number {
  if (k === rest.length) return w;
  const test = rest[k] as WordTest;
  if (w < scratch.count && scratch.passes(test, w)) {
    const end = matchRest(rest, k + 1, w + 1);
    if (end >= 0) return end;
  }
  return test.isOptional ? matchRest(rest, k + 1, w) : -1;
}

/** Whether the phrase whose first word is word w matches. */
function matches(phrase: Phrase, w: number): boolean {
  if (phrase.notBefore && w > 0 && scratch.passes(phrase.notBefore, w - 1)) return false;
  const end = matchRest(phrase.rest, 0, w + 1);
  if (end < 0) return false;
  return !(phrase.notAfter && end < scratch.count && scratch.passes(phrase.notAfter, end));
}

/**
 * The automaton. State 0 is "between words", 1 "inside a word no phrase starts with", and each
 * further state a node of the first-word tree. `next[state * CLASS_COUNT + class]` is the
 * following state; `prefixAt[state]` lists phrases whose first word is a prefix ending there,
 * `exactAt[state]` those whose whole first word ends there.
 */
type Automaton = {
  next: Int32Array;
  prefixAt: (Phrase[] | null)[];
  exactAt: (Phrase[] | null)[];
};

const BETWEEN = 0;
const UNKNOWN_WORD = 1;

function buildAutomaton(firstWords: readonly [WordNode, Phrase][]): Automaton {
  // Merge every phrase's first-word tree into one tree, numbering its nodes as states.
  type Node = { state: number; children: (Node | null)[]; prefix: Phrase[]; exact: Phrase[] };
  const nodes: Node[] = [];
  const newNode = (): Node => {
    const node: Node = { state: nodes.length + 2, children: [], prefix: [], exact: [] };
    nodes.push(node);
    return node;
  };
  const root: Node = { state: BETWEEN, children: [], prefix: [], exact: [] };
  const graft = (from: WordNode, to: Node, phrase: Phrase) => {
    if (from.isWord) to.exact.push(phrase);
    if (from.isPrefix) to.prefix.push(phrase);
    from.children.forEach((child, k) => {
      if (child) graft(child, (to.children[k] ??= newNode()), phrase);
    });
  };
  for (const [head, phrase] of firstWords) graft(head, root, phrase);

  const stateCount = nodes.length + 2;
  const next = new Int32Array(stateCount * CLASS_COUNT);
  const prefixAt: (Phrase[] | null)[] = new Array<Phrase[] | null>(stateCount).fill(null);
  const exactAt: (Phrase[] | null)[] = new Array<Phrase[] | null>(stateCount).fill(null);
  const fill = (state: number, node: Node | null) => {
    for (let k = 0; k < SEPARATOR; k++) {
      next[state * CLASS_COUNT + k] = node?.children[k]?.state ?? UNKNOWN_WORD;
    }
    next[state * CLASS_COUNT + SEPARATOR] = BETWEEN;
  };
  fill(BETWEEN, root);
  fill(UNKNOWN_WORD, null);
  for (const node of nodes) {
    fill(node.state, node);
    if (node.prefix.length > 0) prefixAt[node.state] = node.prefix;
    if (node.exact.length > 0) exactAt[node.state] = node.exact;
  }
  return { next, prefixAt, exactAt };
}

/**
 * One pass over the text: records each word's offsets in `scratch` and the phrase lists whose
 * first word occurs. False when a word holds an apostrophe (the caller removes them first).
 */
function scan(text: string, { next, prefixAt, exactAt }: Automaton): boolean {
  scratch.text = text;
  scratch.pendingCount = 0;
  const n = text.length;
  let starts = scratch.starts;
  let w = -1;
  let state = BETWEEN;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    const to = next[state * CLASS_COUNT + classOf(c)] as number;
    if (to !== BETWEEN) {
      if (state === BETWEEN) {
        if (++w === starts.length) {
          scratch.starts = starts = grown(starts);
          scratch.ends = grown(scratch.ends);
        }
        starts[w] = i;
      }
      const prefix = prefixAt[to];
      if (prefix) scratch.pend(prefix, w);
    } else if (state !== BETWEEN) {
      if ((c === 39 || c === 0x2019) && classOf(text.charCodeAt(i + 1)) !== SEPARATOR) {
        return false;
      }
      scratch.ends[w] = i;
      const exact = exactAt[state];
      if (exact) scratch.pend(exact, w);
    }
    state = to;
  }
  if (state !== BETWEEN) {
    scratch.ends[w] = n;
    const exact = exactAt[state];
    if (exact) scratch.pend(exact, w);
  }
  scratch.count = w + 1;
  return true;
}

const INNER_APOSTROPHE = /(?<=[a-z0-9])['’](?=[a-z0-9])/gi;

export type PhraseClassifier<T> = (text: string) => T | null;

/**
 * Builds a classifier from ordered rules `[value, phrases]`: the value of the first rule (in
 * list order) with a phrase anywhere in the text, or null. Throws on a malformed phrase.
 */
export function buildPhraseClassifier<T>(
  rules: readonly (readonly [T, readonly string[]])[],
): PhraseClassifier<T> {
  const firstWords: [WordNode, Phrase][] = [];
  rules.forEach(([, phrases], rule) => {
    for (const text of phrases) {
      const tokens = text.trim().split(" ");
      const notBefore = tokens[0]?.startsWith("!") ? parseWordTest(tokens[0].slice(1)) : null;
      if (notBefore) tokens.shift();
      const last = tokens.at(-1);
      const notAfter =
        tokens.length > 1 && last?.startsWith("!") ? parseWordTest(last.slice(1)) : null;
      if (notAfter) tokens.pop();
      const [head, ...rest] = tokens.map(parseWordTest);
      if (!head || head.isOptional) {
        throw new Error(`phrase-rules: "${text}" must start with a required word`);
      }
      firstWords.push([head.root, { rule, rest, notBefore, notAfter }]);
    }
  });
  const automaton = buildAutomaton(firstWords);

  return (text) => {
    if (!scan(text, automaton)) scan(text.replace(INNER_APOSTROPHE, ""), automaton);
    // Phrase lists are in rule order, so a list is left at its first rule no better than best.
    let best = rules.length;
    for (let k = 0; k < scratch.pendingCount && best > 0; k++) {
      const list = scratch.pendingLists[k] as Phrase[];
      const w = scratch.pendingWords[k] as number;
      for (const phrase of list) {
        if (phrase.rule >= best) break;
        if (matches(phrase, w)) best = phrase.rule;
      }
    }
    if (scratch.pendingCount > 256) scratch.pendingLists = []; // let a huge text's lists go
    return best < rules.length ? (rules[best] as readonly [T, readonly string[]])[0] : null;
  };
}
