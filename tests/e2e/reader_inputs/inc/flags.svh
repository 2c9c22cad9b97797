assign ready = `READY_EXPR;
