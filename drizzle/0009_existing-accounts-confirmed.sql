-- Sign-up now asks new accounts to confirm their address before the first sign-in; accounts made before
-- that keep signing in as they did.
UPDATE `user` SET `email_verified` = 1 WHERE `email_verified` = 0;
