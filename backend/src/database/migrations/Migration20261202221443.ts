import { Migration } from '@mikro-orm/migrations';

export class Migration20261202221443 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table \`sheet\` add \`results_version\` int null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`sheet\` drop column \`results_version\`;`);
  }

}
