import { Migration } from '@mikro-orm/migrations';

export class Migration20261202153339 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table \`firm\` add \`package_query_register\` tinyint(1) not null default false;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`firm\` drop column \`package_query_register\`;`);
  }

}
