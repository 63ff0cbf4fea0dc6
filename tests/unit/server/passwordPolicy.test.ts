import { describe, expect, it } from 'vitest';
import { passwordProblems, personalPasswordProblems } from '../../../server/security/passwordPolicy';

describe('passwordProblems', () => {
  it.each([
    ['eleven char', 'must be at least 12 characters'],
    ['ü'.repeat(37), 'must be at most 72 bytes (bcrypt reads no further); use fewer or plainer characters'],
    // fix: #12 — common passwords of 12+ characters were accepted.
    ['qwerty123456', 'is one of the most common passwords; choose another (a short sentence of your own works well)'],
    ['1q2w3e4r5t6y', 'is one of the most common passwords; choose another (a short sentence of your own works well)'],
    ['PasswordPassword', 'is one of the most common passwords; choose another (a short sentence of your own works well)'],
    ['Password2024!!!', 'is one of the most common passwords; choose another (a short sentence of your own works well)'],
    ['!!Sunshine1234', 'is one of the most common passwords; choose another (a short sentence of your own works well)'],
    ['abababababab', 'must use at least 5 different characters'],
  ])('when the password is %j, then it is refused: %s', (password, problem) => {
    expect(passwordProblems(password)).toEqual([problem]);
  });

  it.each(['larch-gantry-pulley-77', 'belts hum at 88 hertz', 'Tr0ub4dor&3-timing', 'Spannweite über Rollen'])(
    'when the password is %j, then it passes',
    (password) => {
      expect(passwordProblems(password)).toEqual([]);
    },
  );
});

describe('personalPasswordProblems', () => {
  const person = { email: 'shop.floor7@example.test', name: "Rita O'Rivet" };

  // fix: #12 — a password made of the account's own e-mail or name was accepted.
  it.each([
    ['shop.floor7@example.test!', ['must not contain your e-mail address']],
    ['my-ShopFloor7-stage', ['must not contain your e-mail address']],
    ['floor7 sweeping belts', ['must not contain your e-mail address']],
    ['orivet-likes-belts', ['must not contain your name']],
    ['RitaORivet belts', ['must not contain your name']],
    ['rita at the shop bench', ['must not contain your e-mail address', 'must not contain your name']],
  ])('when the password is %j, then %o', (password, problems) => {
    expect(personalPasswordProblems(password, person)).toEqual(problems);
  });

  it('when the password shares only short pieces with the name, then it passes', () => {
    expect(personalPasswordProblems('ada at the lathe 42', { email: 'ada@example.test', name: 'Ada Li' })).toEqual([]);
  });
});
