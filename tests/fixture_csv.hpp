// Reads the small CSV fixtures of tests/fixtures (header line, comma separated, no quoting).
#pragma once

#include <fstream>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

namespace pwbtest {

using Row = std::vector<std::string>;

inline std::vector<Row> read_csv(const std::string& name) {
  std::ifstream in(std::string(PWB_FIXTURE_DIR) + "/" + name);
  if (!in) throw std::runtime_error("cannot open fixture " + name);
  std::vector<Row> rows;
  std::string line;
  std::getline(in, line);  // header
  while (std::getline(in, line)) {
    if (line.empty()) continue;
    Row r;
    std::stringstream ss(line);
    std::string cell;
    while (std::getline(ss, cell, ',')) r.push_back(cell);
    rows.push_back(r);
  }
  return rows;
}

}  // namespace pwbtest
