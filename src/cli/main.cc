// zvsmap: map where a converter's switches turn on at zero voltage.
#include "cli/run_cli.h"

int main(int argc, char** argv) { return zvsmap::cli::RunCli(argc, argv, {}); }
