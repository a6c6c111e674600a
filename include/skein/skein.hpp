// Skein: umbrella header. The pipeline, one header per stage:
//   case_file (read) -> lattice (mesh) -> influence (assemble) -> solver (solve) -> loads -> report/*
#pragma once

#include "skein/airfoil.hpp"
#include "skein/atmosphere.hpp"
#include "skein/biot_savart.hpp"
#include "skein/case.hpp"
#include "skein/case_edit.hpp"
#include "skein/case_file.hpp"
#include "skein/error.hpp"
#include "skein/influence.hpp"
#include "skein/lattice.hpp"
#include "skein/loads.hpp"
#include "skein/probe.hpp"
#include "skein/profile_drag.hpp"
#include "skein/report/csv.hpp"
#include "skein/report/json.hpp"
#include "skein/report/summary.hpp"
#include "skein/results.hpp"
#include "skein/run.hpp"
#include "skein/solver.hpp"
#include "skein/structural.hpp"
#include "skein/trim.hpp"
