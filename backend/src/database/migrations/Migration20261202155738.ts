import { Migration } from '@mikro-orm/migrations';

export class Migration20261202155738 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table \`invitation\` add \`revoked_at\` datetime null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`invitation\` drop column \`revoked_at\`;`);
  }

}
