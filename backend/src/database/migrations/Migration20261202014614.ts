import { Migration } from '@mikro-orm/migrations';

export class Migration20261202014614 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`revision\` (\`id\` varchar(36) not null, \`sheet_id\` varchar(36) not null, \`number\` int not null, \`code\` varchar(8) not null, \`snapshot\` json not null, \`snapshot_sha256\` varchar(64) not null, \`engine_version\` varchar(20) not null, \`prepared_by_id\` varchar(36) not null, \`checked_by_id\` varchar(36) not null, \`approved_by_id\` varchar(36) not null, \`check_requested_at\` datetime(3) null, \`checked_at\` datetime(3) null, \`approved_at\` datetime(3) null, \`issued_at\` datetime(3) not null, \`pdf_sha256\` varchar(64) null, \`pdf_object_key\` varchar(200) null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`revision\` add index \`revision_sheet_id_index\`(\`sheet_id\`);`);
    this.addSql(`alter table \`revision\` add index \`revision_prepared_by_id_index\`(\`prepared_by_id\`);`);
    this.addSql(`alter table \`revision\` add index \`revision_checked_by_id_index\`(\`checked_by_id\`);`);
    this.addSql(`alter table \`revision\` add index \`revision_approved_by_id_index\`(\`approved_by_id\`);`);
    this.addSql(`alter table \`revision\` add unique \`revision_sheet_id_number_unique\`(\`sheet_id\`, \`number\`);`);

    this.addSql(`create table \`notification\` (\`id\` varchar(36) not null, \`user_id\` varchar(36) not null, \`kind\` varchar(40) not null, \`text\` varchar(500) not null, \`link\` varchar(300) not null, \`read_at\` datetime(3) null, \`created_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`notification\` add index \`notification_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`notification\` add index \`notification_user_id_created_at_index\`(\`user_id\`, \`created_at\`);`);

    this.addSql(`create table \`cell_query\` (\`id\` varchar(36) not null, \`sheet_id\` varchar(36) not null, \`cell_id\` varchar(36) null, \`line\` int null, \`status\` varchar(12) not null default 'open', \`raised_by_id\` varchar(36) not null, \`revision_number\` int not null, \`closed_by_id\` varchar(36) null, \`closed_at\` datetime(3) null, \`created_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`cell_query\` add index \`cell_query_sheet_id_index\`(\`sheet_id\`);`);
    this.addSql(`alter table \`cell_query\` add index \`cell_query_cell_id_index\`(\`cell_id\`);`);
    this.addSql(`alter table \`cell_query\` add index \`cell_query_raised_by_id_index\`(\`raised_by_id\`);`);
    this.addSql(`alter table \`cell_query\` add index \`cell_query_closed_by_id_index\`(\`closed_by_id\`);`);
    this.addSql(`alter table \`cell_query\` add index \`cell_query_sheet_id_status_index\`(\`sheet_id\`, \`status\`);`);

    this.addSql(`create table \`query_message\` (\`id\` varchar(36) not null, \`query_id\` varchar(36) not null, \`author_id\` varchar(36) not null, \`text\` text not null, \`created_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`query_message\` add index \`query_message_query_id_index\`(\`query_id\`);`);
    this.addSql(`alter table \`query_message\` add index \`query_message_author_id_index\`(\`author_id\`);`);

    this.addSql(`alter table \`revision\` add constraint \`revision_sheet_id_foreign\` foreign key (\`sheet_id\`) references \`sheet\` (\`id\`) on update cascade on delete restrict;`);
    this.addSql(`alter table \`revision\` add constraint \`revision_prepared_by_id_foreign\` foreign key (\`prepared_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete restrict;`);
    this.addSql(`alter table \`revision\` add constraint \`revision_checked_by_id_foreign\` foreign key (\`checked_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete restrict;`);
    this.addSql(`alter table \`revision\` add constraint \`revision_approved_by_id_foreign\` foreign key (\`approved_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete restrict;`);

    this.addSql(`alter table \`notification\` add constraint \`notification_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`cell_query\` add constraint \`cell_query_sheet_id_foreign\` foreign key (\`sheet_id\`) references \`sheet\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`cell_query\` add constraint \`cell_query_cell_id_foreign\` foreign key (\`cell_id\`) references \`cell\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`cell_query\` add constraint \`cell_query_raised_by_id_foreign\` foreign key (\`raised_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete restrict;`);
    this.addSql(`alter table \`cell_query\` add constraint \`cell_query_closed_by_id_foreign\` foreign key (\`closed_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);

    this.addSql(`alter table \`query_message\` add constraint \`query_message_query_id_foreign\` foreign key (\`query_id\`) references \`cell_query\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`query_message\` add constraint \`query_message_author_id_foreign\` foreign key (\`author_id\`) references \`app_user\` (\`id\`) on update cascade on delete restrict;`);

    this.addSql(`alter table \`audit_event\` add \`subject_id\` varchar(36) null;`);
    this.addSql(`alter table \`audit_event\` add index \`audit_event_subject_id_index\`(\`subject_id\`);`);

    this.addSql(`alter table \`sheet\` add \`revision_number\` int not null default 1, add \`check_requested_at\` datetime(3) null, add \`checked_at\` datetime(3) null, add \`approved_at\` datetime(3) null;`);

    this.addSql(`alter table \`cell\` add \`agreed_by_id\` varchar(36) null, add \`agreed_at\` datetime(3) null, add \`changed_after_agreement\` tinyint(1) not null default false;`);
    this.addSql(`alter table \`cell\` add constraint \`cell_agreed_by_id_foreign\` foreign key (\`agreed_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`cell\` add index \`cell_agreed_by_id_index\`(\`agreed_by_id\`);`);

    // An issued revision is immutable in the database too: any change to what was issued, a second
    // setting of the package's hash or key, and any delete are refused by MariaDB itself.
    this.addSql(`create trigger \`revision_immutable\` before update on \`revision\` for each row begin if not (NEW.\`sheet_id\` <=> OLD.\`sheet_id\` AND NEW.\`number\` <=> OLD.\`number\` AND NEW.\`code\` <=> OLD.\`code\` AND NEW.\`snapshot\` <=> OLD.\`snapshot\` AND NEW.\`snapshot_sha256\` <=> OLD.\`snapshot_sha256\` AND NEW.\`engine_version\` <=> OLD.\`engine_version\` AND NEW.\`prepared_by_id\` <=> OLD.\`prepared_by_id\` AND NEW.\`checked_by_id\` <=> OLD.\`checked_by_id\` AND NEW.\`approved_by_id\` <=> OLD.\`approved_by_id\` AND NEW.\`check_requested_at\` <=> OLD.\`check_requested_at\` AND NEW.\`checked_at\` <=> OLD.\`checked_at\` AND NEW.\`approved_at\` <=> OLD.\`approved_at\` AND NEW.\`issued_at\` <=> OLD.\`issued_at\`) or (OLD.\`pdf_sha256\` is not null and not (NEW.\`pdf_sha256\` <=> OLD.\`pdf_sha256\`)) or (OLD.\`pdf_object_key\` is not null and not (NEW.\`pdf_object_key\` <=> OLD.\`pdf_object_key\`)) then signal sqlstate '45000' set message_text = 'an issued revision is immutable'; end if; end`);
    this.addSql(`create trigger \`revision_no_delete\` before delete on \`revision\` for each row signal sqlstate '45000' set message_text = 'an issued revision cannot be deleted'`);
  }

  override async down(): Promise<void> {
    this.addSql('drop trigger if exists `revision_immutable`;');
    this.addSql('drop trigger if exists `revision_no_delete`;');
    this.addSql(`alter table \`query_message\` drop foreign key \`query_message_query_id_foreign\`;`);

    this.addSql(`drop table if exists \`revision\`;`);

    this.addSql(`drop table if exists \`notification\`;`);

    this.addSql(`drop table if exists \`cell_query\`;`);

    this.addSql(`drop table if exists \`query_message\`;`);

    this.addSql(`alter table \`cell\` drop foreign key \`cell_agreed_by_id_foreign\`;`);

    this.addSql(`alter table \`sheet\` drop column \`revision_number\`, drop column \`check_requested_at\`, drop column \`checked_at\`, drop column \`approved_at\`;`);

    this.addSql(`alter table \`audit_event\` drop index \`audit_event_subject_id_index\`;`);
    this.addSql(`alter table \`audit_event\` drop column \`subject_id\`;`);

    this.addSql(`alter table \`cell\` drop index \`cell_agreed_by_id_index\`;`);
    this.addSql(`alter table \`cell\` drop column \`agreed_by_id\`, drop column \`agreed_at\`, drop column \`changed_after_agreement\`;`);
  }

}
