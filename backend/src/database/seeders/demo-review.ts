/**
 * The demo's issued revision: sheet C-106 of Kestrel Ridge taken through the real review — check
 * asked by its preparer, passed by the checker, approved and issued by the approver — with the same
 * services the API uses, so the demo's revision A is made exactly as a user's would be.
 */
import { EntityManager, MikroORM, RequestContext } from '@mikro-orm/core';
import type { INestApplicationContext } from '@nestjs/common';
import { authContextOf, type AuthContext } from '../../core/guards/auth.guard';
import { Membership } from '../../firms/entities/membership.entity';
import { Project } from '../../projects/entities/project.entity';
import { WorkflowService } from '../../review/workflow.service';
import { Sheet } from '../../sheets/entities/sheet.entity';
import { DEMO_FIRM_NAME, DEMO_JOB_NUMBER } from './demo.seeder';

export const DEMO_ISSUED_SHEET = 'C-106';

export async function seedDemoReview(app: INestApplicationContext): Promise<string | null> {
  const orm = app.get(MikroORM);
  return RequestContext.create(orm.em, async () => {
    const em = app.get(EntityManager);
    const project = await em.findOne(Project, { jobNumber: DEMO_JOB_NUMBER, firm: { name: DEMO_FIRM_NAME } }, { populate: ['firm'] });
    if (!project) return null;
    const sheet = await em.findOne(Sheet, { project, number: DEMO_ISSUED_SHEET }, { populate: ['preparer'] });
    if (!sheet || sheet.state !== 'being-prepared' || sheet.revisionNumber !== 1) return null;
    const as = async (email: string): Promise<AuthContext> => {
      const m = await em.findOneOrFail(Membership, { firm: project.firm, user: { email } }, { populate: ['user', 'firm'] });
      return authContextOf({ user: m.user, firm: m.firm, tokenHash: '', csrfToken: '' }, m.roles);
    };
    const workflow = app.get(WorkflowService);
    const checker = await as('checker@northfold.example');
    const approver = await as('approver@northfold.example');
    await workflow.requestCheck(await as(sheet.preparer.email), sheet.id, { checkerId: checker.user.id, approverId: approver.user.id });
    await workflow.passCheck(checker, sheet.id);
    await workflow.approve(approver, sheet.id);
    const revision = await workflow.issue(approver, sheet.id);
    return `sheet ${DEMO_ISSUED_SHEET} issued as revision ${revision.code}`;
  });
}
