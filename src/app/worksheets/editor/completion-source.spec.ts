import { CLAUSE_WORDS, CONSTANT_NAMES, COUNT_DOMAIN, DOMAINS, FUNCTION_NAMES, STATEMENT_KEYWORDS } from '@shared/language';
import { completionContext, completionEntries, hoverMarkdown } from './completion-source';

const symbols = {
  params: [{ name: 'd', domain: 'positive' as const, line: 1 }],
  variables: ['x'],
  results: [{ name: 'Z', line: 2 }],
};

describe('completion source', () => {
  const labels = (context: Parameters<typeof completionEntries>[0], kinds: string[]) =>
    completionEntries(context, symbols).filter((e) => kinds.includes(e.kind)).map((e) => e.label);

  it('offers exactly the language’s functions, keywords, clause words, domains and constants', () => {
    expect(labels('expression', ['function'])).toEqual([...FUNCTION_NAMES]);
    expect(labels('line-start', ['keyword'])).toEqual([...STATEMENT_KEYWORDS]);
    expect(labels('expression', ['clause'])).toEqual([...CLAUSE_WORDS]);
    expect(labels('domain', ['domain'])).toEqual([...DOMAINS, COUNT_DOMAIN.label]);
    expect(labels('expression', ['constant'])).toEqual([...CONSTANT_NAMES]);
    const words = new Set(
      (['line-start', 'domain', 'expression'] as const).flatMap((c) => labels(c, ['keyword', 'clause', 'domain', 'function', 'constant'])),
    );
    expect([...words].sort()).toEqual([...STATEMENT_KEYWORDS, ...CLAUSE_WORDS, ...DOMAINS, COUNT_DOMAIN.label, ...FUNCTION_NAMES, ...CONSTANT_NAMES].sort());
    for (const rejected of ['tan', 'abs', 're', 'im', 'arg', 'tanh', 'atan', 'e']) expect(words.has(rejected)).toBe(false);
  });

  it('offers the declared names from the report, not from the text', () => {
    expect(labels('expression', ['result', 'parameter', 'variable'])).toEqual(['Z', 'd', 'x']);
    expect(completionEntries('expression', null).some((e) => e.kind === 'parameter')).toBe(false);
  });

  it('tells the context from the text before the word', () => {
    expect(completionContext('   ')).toBe('line-start');
    expect(completionContext('param a, b : ')).toBe('domain');
    expect(completionContext('integral Z = exp(')).toBe('expression');
    expect(completionContext('parameter : ')).toBe('expression');
  });

  it('explains words with the language’s help texts', () => {
    expect(hoverMarkdown('sqrt', new Map(), null)).toContain('principal square root');
    expect(hoverMarkdown('param', new Map(), null)).toContain('param k : positive');
    expect(hoverMarkdown('d', new Map(), symbols)).toContain('positive real number');
    expect(hoverMarkdown('Z', new Map([['Z', 'sqrt(2*pi)']]), symbols)).toBe('**Z** = `sqrt(2*pi)`');
    expect(hoverMarkdown('toString', new Map(), null)).toBeNull();
  });
});
