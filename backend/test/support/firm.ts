/**
 * One firm with one of every resource, made through the API: a project; a sheet issued as revision A
 * (through check and approval, with a closed query) and its package; a sheet being prepared, with the checker's
 * query still open, an attachment and a template made from it; notifications and members.
 */
import type { INestApplication } from '@nestjs/common';
import type { ResourceIds } from './routes';
import { as, makeCaller, type Caller } from './sessions';

// The smallest well-formed PNG, by its published signature (ISO/IEC 15948, PNG file signature and IHDR).
export const PNG = Buffer.concat([
  Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
  Buffer.from('0000000d49484452000000010000000108060000001f15c489', 'hex'),
]);

export interface FirmWorld {
  engineer: Caller;
  checker: Caller;
  approver: Caller;
  ids: ResourceIds;
}

/** `mark` is put in every title and text, so that a leak of this firm's work can be searched for. */
export async function buildFirm(app: INestApplication, mark: string): Promise<FirmWorld> {
  const engineer = await makeCaller(app, ['owner', 'engineer']);
  const checker = await makeCaller(app, ['checker'], engineer.firm);
  const approver = await makeCaller(app, ['approver'], engineer.firm);
  const project = (
    await as(app, engineer, 'post', '/api/projects')
      .send({ jobNumber: 'X-1', title: `${mark} project`, clientOrganisation: 'A client', site: 'A site' })
      .expect(201)
  ).body;
  const issued = (
    await as(app, engineer, 'post', `/api/projects/${project.id}/sheets`)
      .send({
        number: 'C-1',
        sheet: {
          format: 'ampwright.sheet/1',
          title: `${mark} sheet`,
          cells: [
            { kind: 'calc', source: `R = 10 ohm # ${mark}` },
            { kind: 'check', condition: 'R <= 20 ohm' },
          ],
        },
      })
      .expect(201)
  ).body;
  await as(app, engineer, 'post', `/api/sheets/${issued.id}/request-check`).send({ checkerId: checker.user.id, approverId: approver.user.id }).expect(200);
  const query = (
    await as(app, checker, 'post', `/api/sheets/${issued.id}/queries`)
      .send({ cellId: issued.cells[0].id, text: `${mark} query` })
      .expect(201)
  ).body;
  await as(app, checker, 'post', `/api/queries/${query.id}/close`).send({}).expect(200);
  await as(app, checker, 'post', `/api/sheets/${issued.id}/pass`).expect(200);
  await as(app, approver, 'post', `/api/sheets/${issued.id}/approve`).expect(200);
  const revision = (await as(app, approver, 'post', `/api/sheets/${issued.id}/issue`).expect(200)).body;
  // The package is made in the background; wait for it, so that the firm's work no longer changes by itself.
  for (let k = 0; k < 300; k++) {
    const { status } = (await as(app, approver, 'get', `/api/revisions/${revision.id}/package/status`).expect(200)).body;
    if (status === 'done') break;
    if (status === 'failed' || k === 299) throw new Error(`the package of the test revision was not made (${status})`);
    await new Promise((r) => setTimeout(r, 100));
  }
  const sheet = (
    await as(app, engineer, 'post', `/api/projects/${project.id}/sheets`)
      .send({
        number: 'C-2',
        sheet: {
          format: 'ampwright.sheet/1',
          title: `${mark} draft`,
          cells: [
            { kind: 'calc', source: `x = 1 # ${mark}` },
            { kind: 'calc', source: 'y = 2' },
          ],
        },
      })
      .expect(201)
  ).body;
  await as(app, engineer, 'post', `/api/sheets/${sheet.id}/request-check`).send({ checkerId: checker.user.id }).expect(200);
  const openQuery = (
    await as(app, checker, 'post', `/api/sheets/${sheet.id}/queries`)
      .send({ cellId: sheet.cells[0].id, text: `${mark} open query` })
      .expect(201)
  ).body;
  const attachment = (await as(app, engineer, 'post', `/api/sheets/${sheet.id}/attachments`).attach('file', PNG, 'feeder.png').expect(201)).body;
  const template = (
    await as(app, engineer, 'post', '/api/templates')
      .send({ sheetId: sheet.id, title: `${mark} template` })
      .expect(201)
  ).body;
  const notification = (await as(app, engineer, 'get', '/api/notifications').expect(200)).body[0];
  const member = ((await as(app, engineer, 'get', '/api/members').expect(200)).body as { id: string; user: { email: string } }[]).find(
    (m) => m.user.email === checker.user.email,
  )!;
  const invitation = (
    await as(app, engineer, 'post', '/api/invitations')
      .send({ email: `${mark.toLowerCase().replace(/[^a-z0-9]/g, '')}-invitee@invited.example`, roles: ['engineer'] })
      .expect(201)
  ).body;
  return {
    engineer,
    checker,
    approver,
    ids: {
      project: project.id,
      sheet: sheet.id,
      issuedSheet: issued.id,
      cell: sheet.cells[0].id,
      query: openQuery.id,
      revision: revision.id,
      attachment: attachment.id,
      template: template.id,
      notification: notification.id,
      member: member.id,
      invitation: invitation.id,
    },
  };
}
