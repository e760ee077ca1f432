import { Migration } from '@mikro-orm/migrations';

export class Migration20261202152009 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table \`package_job\` add \`claim_token\` varchar(36) null, add \`heartbeat_at\` datetime(3) null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`package_job\` drop column \`claim_token\`, drop column \`heartbeat_at\`;`);
  }

}
