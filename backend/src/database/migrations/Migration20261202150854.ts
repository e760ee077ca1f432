import { Migration } from '@mikro-orm/migrations';

export class Migration20261202150854 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`sheet_author\` (\`id\` varchar(36) not null, \`sheet_id\` varchar(36) not null, \`revision_number\` int not null, \`user_id\` varchar(36) not null, \`named\` tinyint(1) not null default false, \`edited\` tinyint(1) not null default false, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`sheet_author\` add index \`sheet_author_sheet_id_index\`(\`sheet_id\`);`);
    this.addSql(`alter table \`sheet_author\` add index \`sheet_author_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`sheet_author\` add unique \`sheet_author_sheet_id_revision_number_user_id_unique\`(\`sheet_id\`, \`revision_number\`, \`user_id\`);`);

    this.addSql(`alter table \`sheet_author\` add constraint \`sheet_author_sheet_id_foreign\` foreign key (\`sheet_id\`) references \`sheet\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`sheet_author\` add constraint \`sheet_author_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`sheet_author\`;`);
  }

}
