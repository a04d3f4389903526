#include "cli/run.hpp"

int main(int argc, char** argv) { return sortie::cli::run(argc, argv); }
