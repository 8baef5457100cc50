// zvsmap_faulty: the real zvsmap command line (cli::RunCli) for the e2e
// tests, whose `run` workers get the fault plan named in this test binary's
// environment variable ZVSMAP_TEST_FAULT ("kind:index,...", kinds hang,
// segv, exitcb, hog; see testing/fault_injection.h). Never installed; the
// zvsmap binary itself reads no fault from anywhere.
#include <cstdio>
#include <cstdlib>
#include <string>

#include "cli/run_cli.h"
#include "testing/fault_injection.h"

int main(int argc, char** argv) {
  zvsmap::cli::CliSeams seams;
  if (const char* text = std::getenv("ZVSMAP_TEST_FAULT")) {
    zvsmap::testing_support::FaultPlan plan;
    std::string error;
    if (!zvsmap::testing_support::ParseFaultPlan(text, &plan, &error)) {
      std::fprintf(stderr, "zvsmap_faulty: %s\n", error.c_str());
      return 2;
    }
    seams.workers = [plan](zvsmap::WorkerSetup setup) {
      return zvsmap::testing_support::InjectFaults(std::move(setup), plan);
    };
  }
  return zvsmap::cli::RunCli(argc, argv, seams);
}
