// The one translation unit that builds Catch2's main for the unit-test binary.
#define CATCH_CONFIG_MAIN
#include <catch2/catch.hpp>
