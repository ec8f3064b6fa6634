/** The project's relative-closeness matcher: passes within the tolerance, fails outside it, and says why. */
describe('toBeRelClose', () => {
  test('passes within the relative tolerance and fails outside it', () => {
    expect(1 + 1e-13).toBeRelClose(1, 1e-12);
    expect(1 + 1e-11).not.toBeRelClose(1, 1e-12);
    expect(0).toBeRelClose(0, 1e-15);
    expect(1e-300).not.toBeRelClose(0, 1e-15);
    expect(Number.NaN).not.toBeRelClose(1, 1);
  });

  test('the failure message prints both numbers and their difference', () => {
    let message = '';
    try {
      expect(2.5).toBeRelClose(2, 1e-6);
    } catch (e) {
      message = (e as Error).message;
    }
    expect(message).toMatch(/2\.5/);
    expect(message).toMatch(/expected.*2/);
    expect(message).toMatch(/difference 0\.5 \(relative 0\.25\)/);
  });
});
