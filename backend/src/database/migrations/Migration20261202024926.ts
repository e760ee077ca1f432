import { Migration } from '@mikro-orm/migrations';

export class Migration20261202024926 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`sheet_template\` (\`id\` varchar(36) not null, \`firm_id\` varchar(36) not null, \`title\` varchar(200) not null, \`sheet\` json not null, \`created_by_id\` varchar(36) null, \`created_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`sheet_template\` add index \`sheet_template_firm_id_index\`(\`firm_id\`);`);
    this.addSql(`alter table \`sheet_template\` add index \`sheet_template_created_by_id_index\`(\`created_by_id\`);`);
    this.addSql(`alter table \`sheet_template\` add index \`sheet_template_firm_id_title_index\`(\`firm_id\`, \`title\`);`);

    this.addSql(`alter table \`sheet_template\` add constraint \`sheet_template_firm_id_foreign\` foreign key (\`firm_id\`) references \`firm\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`sheet_template\` add constraint \`sheet_template_created_by_id_foreign\` foreign key (\`created_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`sheet_template\`;`);
  }

}
