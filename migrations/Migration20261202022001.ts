import { Migration } from '@mikro-orm/migrations';

export class Migration20261202022001 extends Migration {

  override async up(): Promise<void> {
    // Failed sign-ins, counted by rate-limiter-flexible (its own table layout; written by hand).
    this.addSql(`create table "sign_in_attempt" ("key" varchar(255) primary key, "points" integer not null default 0, "expire" bigint);`);
    this.addSql(`create table "outbox_message" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "to_address" varchar(320) not null, "subject" varchar(300) not null, "text_body" text not null, "html_body" text null, "status" text check ("status" in ('pending', 'sent', 'failed')) not null default 'pending', "attempts" smallint not null default 0, "next_attempt_at" timestamptz not null, "last_error" text null, "sent_at" timestamptz null, "template" varchar(100) not null);`);
    this.addSql(`create index "outbox_message_next_attempt_at_index" on "outbox_message" ("next_attempt_at");`);

    this.addSql(`create table "app_user" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "email" varchar(320) not null, "name" varchar(200) not null, "password_hash" varchar(400) not null, "roles" text[] not null default '{}', "status" text check ("status" in ('active', 'deactivated')) not null default 'active', "email_confirmed_at" timestamptz null, "last_sign_in_at" timestamptz null);`);
    this.addSql(`alter table "app_user" add constraint "app_user_email_unique" unique ("email");`);

    this.addSql(`create table "user_session" ("id" varchar(64) not null, "user_id" int not null, "created_at" timestamptz not null, "last_seen_at" timestamptz not null, "expires_at" timestamptz not null, "user_agent" varchar(300) not null default '', constraint "user_session_pkey" primary key ("id"));`);
    this.addSql(`create index "user_session_user_id_index" on "user_session" ("user_id");`);
    this.addSql(`create index "user_session_expires_at_index" on "user_session" ("expires_at");`);

    this.addSql(`create table "api_token" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "user_id" int not null, "label" varchar(100) not null, "token_hash" varchar(64) not null, "prefix" varchar(16) not null, "last_used_at" timestamptz null, "revoked_at" timestamptz null);`);
    this.addSql(`create index "api_token_user_id_index" on "api_token" ("user_id");`);
    this.addSql(`alter table "api_token" add constraint "api_token_token_hash_unique" unique ("token_hash");`);

    this.addSql(`create table "account_token" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "purpose" text check ("purpose" in ('invitation', 'password_reset', 'email_confirmation')) not null, "email" varchar(320) not null, "roles" text[] not null default '{}', "user_id" int null, "created_by_id" int null, "token_hash" varchar(64) not null, "expires_at" timestamptz not null, "used_at" timestamptz null);`);
    this.addSql(`create index "account_token_email_index" on "account_token" ("email");`);
    this.addSql(`alter table "account_token" add constraint "account_token_token_hash_unique" unique ("token_hash");`);

    this.addSql(`alter table "user_session" add constraint "user_session_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade on delete cascade;`);

    this.addSql(`alter table "api_token" add constraint "api_token_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade on delete cascade;`);

    this.addSql(`alter table "account_token" add constraint "account_token_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade on delete cascade;`);
    this.addSql(`alter table "account_token" add constraint "account_token_created_by_id_foreign" foreign key ("created_by_id") references "app_user" ("id") on update cascade on delete set null;`);


  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "sign_in_attempt";`);
    this.addSql(`alter table "user_session" drop constraint "user_session_user_id_foreign";`);

    this.addSql(`alter table "api_token" drop constraint "api_token_user_id_foreign";`);

    this.addSql(`alter table "account_token" drop constraint "account_token_user_id_foreign";`);

    this.addSql(`alter table "account_token" drop constraint "account_token_created_by_id_foreign";`);

    this.addSql(`drop table if exists "outbox_message" cascade;`);

    this.addSql(`drop table if exists "app_user" cascade;`);

    this.addSql(`drop table if exists "user_session" cascade;`);

    this.addSql(`drop table if exists "api_token" cascade;`);

    this.addSql(`drop table if exists "account_token" cascade;`);


  }

}
