import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import { Design } from '../../server/models';
import { createDesign, createUser, signedInAs, type Agent } from '../helpers/factories';

const app = createApp();
afterAll(() => closeSequelize());

let admin: Agent;
beforeAll(async () => {
  admin = (await signedInAs(app, ['admin'])).agent;
});

const tag = () => `t${randomBytes(5).toString('hex')}`;
const names = (res: { body: { items: { name: string }[] } }) => res.body.items.map((d) => d.name);

describe('GET /api/designs search (FULLTEXT)', () => {
  it('when the beginning of a word is typed, then names with a word starting so are found, and not ones containing it elsewhere', async () => {
    // Arrange
    const t = tag();
    const { user } = await createUser({ roles: ['designer'] });
    await createDesign({ owner: user, name: `${t} dispensing stage` });
    await createDesign({ owner: user, name: `${t} engraving table` });
    await createDesign({ owner: user, name: `${t} redispensed rig` });

    // Act
    const res = await admin.get(`/api/designs?q=${t}%20dispens&sort=name`);

    // Assert: "dispens" begins a word of the first name only; "redispensed" contains it mid-word
    expect(names(res)).toEqual([`${t} dispensing stage`]);
    expect(res.body.total).toBe(1);
  });

  it('when only short words are typed, then names beginning with the text are found', async () => {
    const t = `x${randomBytes(1).toString('hex')}`;
    const { user } = await createUser({ roles: ['designer'] });
    const unique = `${t} ${tag()}`;
    await createDesign({ owner: user, name: unique });

    // Two characters: shorter than the words the FULLTEXT index holds.
    const res = await admin.get(`/api/designs?q=${encodeURIComponent(unique.slice(0, 2))}&pageSize=100`);

    expect(names(res)).toContain(unique);
    expect(res.body.items.every((d: { name: string }) => d.name.toLowerCase().startsWith(unique.slice(0, 2).toLowerCase()))).toBe(true);
  });
});

describe('GET /api/designs sort by owner', () => {
  it('when a design is created, then the owner name it sorts by is the owner’s', async () => {
    const { user } = await createUser({ roles: ['designer'], name: `Owner ${tag()}` });

    const { id } = await createDesign({ owner: user, name: `Owned ${tag()}` });

    expect((await Design.findByPk(id))!.ownerName).toBe(user.name);
  });

  it('when the owner is renamed, then sorting by owner follows the new name', async () => {
    // Arrange: two owners whose order flips with the rename
    const t = tag();
    const a = await createUser({ roles: ['designer'], name: `Aaa ${t}` });
    const b = await createUser({ roles: ['designer'], name: `Bbb ${t}` });
    await createDesign({ owner: a.user, name: `${t} first` });
    await createDesign({ owner: b.user, name: `${t} second` });
    const before = await admin.get(`/api/designs?q=${t}&sort=owner`);

    // Act
    const renamed = await admin.patch(`/api/users/${a.user.id}`).send({ name: `Zzz ${t}` });
    const after = await admin.get(`/api/designs?q=${t}&sort=owner`);

    // Assert
    expect(renamed.status).toBe(200);
    expect(names(before)).toEqual([`${t} first`, `${t} second`]);
    expect(names(after)).toEqual([`${t} second`, `${t} first`]);
    expect(after.body.items[1].owner.name).toBe(`Zzz ${t}`);
  });
});

describe('GET /api/designs deep pages', () => {
  it('when pages are read one after another, then together they hold every design once, in the sort order', async () => {
    const t = tag();
    const { user } = await createUser({ roles: ['designer'] });
    for (let i = 0; i < 7; i++) await createDesign({ owner: user, name: `${t} ${String.fromCharCode(103 - i)}` });

    const pages = [];
    for (let page = 1; page <= 3; page++) pages.push(await admin.get(`/api/designs?q=${t}&sort=name&pageSize=3&page=${page}`));

    expect(pages.flatMap(names)).toEqual(['a', 'b', 'c', 'd', 'e', 'f', 'g'].map((c) => `${t} ${c}`));
    expect(pages.map((p) => p.body.total)).toEqual([7, 7, 7]);
  });
});
