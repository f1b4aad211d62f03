declare module "s3rver";
