#include "app/cli.hpp"

int main(int argc, char** argv) { return dm::app::runCli(argc, argv); }
