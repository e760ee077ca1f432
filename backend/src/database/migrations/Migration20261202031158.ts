import { Migration } from '@mikro-orm/migrations';

export class Migration20261202031158 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`project_member\` (\`id\` varchar(36) not null, \`project_id\` varchar(36) not null, \`user_id\` varchar(36) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`project_member\` add index \`project_member_project_id_index\`(\`project_id\`);`);
    this.addSql(`alter table \`project_member\` add index \`project_member_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`project_member\` add unique \`project_member_project_id_user_id_unique\`(\`project_id\`, \`user_id\`);`);

    this.addSql(`alter table \`project_member\` add constraint \`project_member_project_id_foreign\` foreign key (\`project_id\`) references \`project\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`project_member\` add constraint \`project_member_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`project_member\`;`);
  }

}
