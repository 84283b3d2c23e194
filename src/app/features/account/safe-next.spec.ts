import { safeNext } from './safe-next';

describe('safeNext', () => {
  test.each([
    ['/studios/1/bench', '/studios/1/bench'],
    [undefined, '/'],
    ['', '/'],
    ['https://evil.example/', '/'],
    ['//evil.example/', '/'],
    ['javascript:alert(1)', '/'],
  ])('%s → %s', (next, expected) => {
    expect(safeNext(next, '/')).toBe(expected);
  });
});
