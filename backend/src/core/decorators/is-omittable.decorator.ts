import { ValidateIf } from 'class-validator';

/**
 * Like @IsOptional(), except that only a missing key is skipped: null goes through the field's
 * other checks and is refused there with a 400. For fields whose column is NOT NULL, where
 * @IsOptional() let {"name": null} through to the database and answered 500.
 */
export const IsOmittable = (): PropertyDecorator => ValidateIf((_object: object, value: unknown) => value !== undefined);
