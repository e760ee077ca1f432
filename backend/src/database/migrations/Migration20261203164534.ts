import { Migration } from '@mikro-orm/migrations';

/** A package job remembers the request that queued it, so the job's log lines can name that request's id. */
export class Migration20261203164534 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table \`package_job\` add \`request_id\` varchar(64) null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`package_job\` drop column \`request_id\`;`);
  }

}
